"""Peer solvers for the benchmark (test/bench/peers.bench.ts) on the footprint's exported conic problems.

    python peers.py SOLVER MODE PROBLEMS.json [FIRST_K]

SOLVER: clarabel | ecos (run with the bench's own virtual environment, .bench-venv/) or cvxopt (Debian's
/usr/bin/python3). MODE: cold (every problem set up and solved from nothing) or update (clarabel only: one
solver per session, its data replaced with DefaultSolver.update before each solve after the first, so the
factorisation's symbolic analysis is kept; Clarabel has no warm start of the iterates). FIRST_K limits the
run to the first K problems (CVXOPT is slow on these: its conelp factorises the KKT system densely whenever
there are second-order cones).

Every solver gets the same tolerances, 1e-8 (gap absolute and relative, feasibility, infeasibility) and at
most 100 iterations, like ours. Time is CPU time of this process (time.process_time) around the solver's own
calls only (data conversion excluded), after one untimed solve of the first problem; BLAS threads are pinned
to one by the caller (OPENBLAS_NUM_THREADS=1 …), so every solver uses one core, as one of our workers does.
Writes a JSON list: {status, iterations, cpu_s, objective} per problem, status in our names.
"""
import json
import math
import sys
import time

TOL = 1e-8
MAX_ITER = 100


def finite(v):
    """JSON has no NaN: a missing or non-finite objective (infeasible problems) is null."""
    return float(v) if v is not None and math.isfinite(float(v)) else None


def load(path, first_k):
    with open(path) as f:
        data = json.load(f)
    problems = data["problems"]
    return problems[:first_k] if first_k else problems


def clarabel_status(s):
    name = str(s).split(".")[-1]
    return {
        "Solved": "solved", "AlmostSolved": "almost-solved",
        "PrimalInfeasible": "primal-infeasible", "AlmostPrimalInfeasible": "almost-primal-infeasible",
        "DualInfeasible": "dual-infeasible", "AlmostDualInfeasible": "almost-dual-infeasible",
        "MaxIterations": "max-iterations",
    }.get(name, "numerical-error")


def run_clarabel(problems, mode):
    import numpy as np
    import scipy.sparse as sp
    import clarabel

    def data(p):
        n = p["n"]
        A = sp.csc_matrix((p["A"]["vals"], (p["A"]["rows"], p["A"]["cols"])), shape=(p["A"]["m"], n))
        G = sp.csc_matrix((p["G"]["vals"], (p["G"]["rows"], p["G"]["cols"])), shape=(p["G"]["m"], n))
        M = sp.vstack([A, G], format="csc")
        M.sort_indices()
        cones = []
        if p["A"]["m"] > 0:
            cones.append(clarabel.ZeroConeT(p["A"]["m"]))
        if p["nonnegative"] > 0:
            cones.append(clarabel.NonnegativeConeT(p["nonnegative"]))
        cones += [clarabel.SecondOrderConeT(q) for q in p["secondOrder"]]
        P = sp.csc_matrix((n, n))
        return P, np.array(p["c"], dtype=float), M, np.concatenate([np.array(p["b"], float), np.array(p["h"], float)]), cones

    def settings():
        s = clarabel.DefaultSettings()
        s.verbose = False
        s.tol_gap_abs = s.tol_gap_rel = s.tol_feas = TOL
        s.tol_infeas_abs = s.tol_infeas_rel = TOL
        s.max_iter = MAX_ITER
        s.max_threads = 1
        return s

    def result(sol, cpu):
        return {"status": clarabel_status(sol.status), "iterations": int(sol.iterations), "cpu_s": cpu,
                "objective": finite(sol.obj_val)}

    prepared = [data(p) for p in problems]
    # Untimed first solve (library loading, first-call costs).
    clarabel.DefaultSolver(*prepared[0], settings()).solve()
    out = []
    if mode == "cold":
        for d in prepared:
            st = settings()
            t0 = time.process_time()
            solver = clarabel.DefaultSolver(*d, st)
            sol = solver.solve()
            out.append(result(sol, time.process_time() - t0))
        return out
    # update: one solver per session; Clarabel's data update keeps its symbolic factorisation.
    solvers = {}
    for p, (P, q, M, b, cones) in zip(problems, prepared):
        key = p["session"]
        if key not in solvers:
            st = settings()
            t0 = time.process_time()
            solvers[key] = clarabel.DefaultSolver(P, q, M, b, cones, st)
            sol = solvers[key].solve()
            out.append(dict(result(sol, time.process_time() - t0), first=True))
            continue
        solver = solvers[key]
        if not solver.is_data_update_allowed():
            raise RuntimeError("Clarabel refuses data updates for these problems (presolve or chordal decomposition changed them)")
        t0 = time.process_time()
        solver.update(q=q, A=M, b=b)
        sol = solver.solve()
        out.append(dict(result(sol, time.process_time() - t0), first=False))
    return out


def run_ecos(problems):
    import numpy as np
    import scipy.sparse as sp
    import ecos

    flags = {0: "solved", 1: "primal-infeasible", 2: "dual-infeasible", 10: "almost-solved",
             11: "almost-primal-infeasible", 12: "almost-dual-infeasible", -1: "max-iterations"}

    def data(p):
        n = p["n"]
        G = sp.csc_matrix((p["G"]["vals"], (p["G"]["rows"], p["G"]["cols"])), shape=(p["G"]["m"], n))
        A = sp.csc_matrix((p["A"]["vals"], (p["A"]["rows"], p["A"]["cols"])), shape=(p["A"]["m"], n))
        dims = {"l": p["nonnegative"], "q": list(p["secondOrder"]), "e": 0}
        return np.array(p["c"], float), G, np.array(p["h"], float), dims, A, np.array(p["b"], float)

    def solve(d):
        c, G, h, dims, A, b = d
        kw = {"abstol": TOL, "reltol": TOL, "feastol": TOL, "max_iters": MAX_ITER, "verbose": False}
        if A.shape[0] > 0:
            return ecos.solve(c, G, h, dims, A, b, **kw)
        return ecos.solve(c, G, h, dims, **kw)

    prepared = [data(p) for p in problems]
    solve(prepared[0])
    out = []
    for d in prepared:
        t0 = time.process_time()
        sol = solve(d)
        cpu = time.process_time() - t0
        info = sol["info"]
        out.append({"status": flags.get(int(info["exitFlag"]), "numerical-error"), "iterations": int(info["iter"]),
                    "cpu_s": cpu, "objective": finite(info["pcost"])})
    return out


def run_cvxopt(problems):
    from cvxopt import matrix, spmatrix, solvers

    statuses = {"optimal": "solved", "primal infeasible": "primal-infeasible", "dual infeasible": "dual-infeasible",
                "unknown": "max-iterations"}
    solvers.options.update({"show_progress": False, "abstol": TOL, "reltol": TOL, "feastol": TOL, "maxiters": MAX_ITER})

    def sparse(block):
        return spmatrix([float(v) for v in block["vals"]], [int(r) for r in block["rows"]],
                        [int(c) for c in block["cols"]], (int(block["m"]), int(block["n"])), "d")

    def data(p):
        kw = {}
        if p["A"]["m"] > 0:
            kw = {"A": sparse(p["A"]), "b": matrix([float(v) for v in p["b"]], (len(p["b"]), 1), "d")}
        return (matrix([float(v) for v in p["c"]], (p["n"], 1), "d"), sparse(p["G"]),
                matrix([float(v) for v in p["h"]], (len(p["h"]), 1), "d"),
                {"l": int(p["nonnegative"]), "q": [int(q) for q in p["secondOrder"]], "s": []}, kw)

    prepared = [data(p) for p in problems]
    c, G, h, dims, kw = prepared[0]
    solvers.conelp(c, G, h, dims, **kw)
    out = []
    for c, G, h, dims, kw in prepared:
        t0 = time.process_time()
        try:
            sol = solvers.conelp(c, G, h, dims, **kw)
        except (ArithmeticError, ValueError) as exc:  # conelp raises on singular KKT systems: report, never hide
            out.append({"status": "numerical-error", "iterations": -1, "cpu_s": time.process_time() - t0, "objective": None,
                        "error": str(exc)})
            continue
        cpu = time.process_time() - t0
        obj = sol["primal objective"]
        out.append({"status": statuses.get(sol["status"], "numerical-error"), "iterations": int(sol["iterations"]),
                    "cpu_s": cpu, "objective": finite(obj)})
    return out


def versions(solver):
    if solver == "clarabel":
        import clarabel
        return clarabel.__version__
    if solver == "ecos":
        import ecos
        return ecos.__version__
    import cvxopt
    return cvxopt.__version__


def main():
    solver, mode, path = sys.argv[1], sys.argv[2], sys.argv[3]
    first_k = int(sys.argv[4]) if len(sys.argv) > 4 else 0
    problems = load(path, first_k)
    if solver == "clarabel":
        results = run_clarabel(problems, mode)
    elif solver == "ecos":
        results = run_ecos(problems)
    elif solver == "cvxopt":
        results = run_cvxopt(problems)
    else:
        raise SystemExit(f"unknown solver {solver!r}: clarabel, ecos or cvxopt")
    json.dump({"solver": solver, "version": versions(solver), "mode": mode, "results": results}, sys.stdout, allow_nan=False)


if __name__ == "__main__":
    main()
