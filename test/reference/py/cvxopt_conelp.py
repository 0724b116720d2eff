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

# Tighter than CVXOPT's defaults (1e-7, 1e-6, 1e-7) so objectives can be compared to 1e-6 relative;
# a problem may override any of these (and choose "kktsolver") through its "options".
DEFAULTS = {"show_progress": False, "abstol": 1e-9, "reltol": 1e-9, "feastol": 1e-9, "maxiters": 100}


def sparse(block):
    return spmatrix([float(v) for v in block["vals"]], [int(r) for r in block["rows"]],
                    [int(c) for c in block["cols"]], (int(block["m"]), int(block["n"])), "d")


def tolist(v):
    return None if v is None else [float(t) for t in v]


def solve(p):
    kw = {}
    opts = dict(DEFAULTS)
    opts.update(p.get("options", {}))
    kktsolver = opts.pop("kktsolver", None)
    for k, v in opts.items():
        solvers.options[k] = v
    c = matrix([float(v) for v in p["c"]], (len(p["c"]), 1), "d")
    G = sparse(p["G"])
    h = matrix([float(v) for v in p["h"]], (len(p["h"]), 1), "d")
    dims = {"l": int(p["nonnegative"]), "q": [int(q) for q in p["secondOrder"]], "s": []}
    if kktsolver:
        kw["kktsolver"] = kktsolver
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
