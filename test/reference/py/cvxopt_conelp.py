#!/usr/bin/python3
"""Reference solves with CVXOPT's conelp (Debian python3-cvxopt).

Reads a JSON list of problems on stdin, writes a JSON list of results on stdout.
Problem: {"n", "c", "A": {"m","n","rows","cols","vals"}, "b", "G": {...}, "h",
          "nonnegative": l, "secondOrder": [q1, ...]}
Result:  {"status": "optimal" | "primal infeasible" | "dual infeasible" | "unknown",
          "x", "y", "z", "s", "primalObjective", "dualObjective", "iterations", "seconds"}
"""
import json
import sys
import time

from cvxopt import matrix, spmatrix, solvers

solvers.options["show_progress"] = False
solvers.options["abstol"] = 1e-10
solvers.options["reltol"] = 1e-10
solvers.options["feastol"] = 1e-10
solvers.options["maxiters"] = 200


def sparse(block):
    return spmatrix([float(v) for v in block["vals"]], [int(r) for r in block["rows"]],
                    [int(c) for c in block["cols"]], (int(block["m"]), int(block["n"])), "d")


def tolist(v):
    return None if v is None else [float(t) for t in v]


def solve(p):
    opts = p.get("options", {})
    for k, v in opts.items():
        solvers.options[k] = v
    c = matrix([float(v) for v in p["c"]], (len(p["c"]), 1), "d")
    G = sparse(p["G"])
    h = matrix([float(v) for v in p["h"]], (len(p["h"]), 1), "d")
    dims = {"l": int(p["nonnegative"]), "q": [int(q) for q in p["secondOrder"]], "s": []}
    kw = {}
    if p["A"]["m"] > 0:
        kw["A"] = sparse(p["A"])
        kw["b"] = matrix([float(v) for v in p["b"]], (len(p["b"]), 1), "d")
    t0 = time.perf_counter()
    sol = solvers.conelp(c, G, h, dims, **kw)
    t1 = time.perf_counter()
    return {
        "status": sol["status"],
        "x": tolist(sol["x"]), "y": tolist(sol["y"]), "z": tolist(sol["z"]), "s": tolist(sol["s"]),
        "primalObjective": sol["primal objective"], "dualObjective": sol["dual objective"],
        "iterations": sol["iterations"], "seconds": t1 - t0,
    }


def main():
    problems = json.load(sys.stdin)
    out = []
    for p in problems:
        try:
            out.append(solve(p))
        except Exception as exc:  # report, never hide
            out.append({"status": "error", "error": str(exc)})
    json.dump(out, sys.stdout)


if __name__ == "__main__":
    main()
