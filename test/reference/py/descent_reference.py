#!/usr/bin/python3
"""Independent reference formulation of minimum-propellant powered descent (Debian python3-cvxopt).

Written from the published equations, not from the project's code: it never imports or reads the
project's matrices. Its input is only the physical description of a scenario (JSON on stdin, one
list of jobs); it builds its own discrete-time problem and solves it with cvxopt.solvers.conelp.

Continuous-time model
  Blackmore, Açıkmeşe & Scharf 2010 (JGCD 33(4)), surface frame rotating with the planet at ω:
      r̈ = u + g − 2 ω × ṙ − ω × (ω × r),   u = T/m (thrust acceleration)
  Açıkmeşe & Ploen 2007 (JGCD 30(5)), change of variables z = ln m, σ = Γ/m (slack of ‖T‖ ≤ Γ):
      ż = −α σ,   ‖u‖ ≤ σ
  Mass-flow constant with n engines of full thrust T_e canted by φ (derived here from the physics):
  each engine burns T_e·throttle/(Isp g0) for its full thrust, yet only T_e cos φ of it points
  along the vehicle axis (the lateral parts cancel), so the net thrust is ‖T‖ = n T_e cos φ ·
  throttle and ṁ = −n T_e throttle/(Isp g0) = −‖T‖/(Isp g0 cos φ): α = 1/(Isp g0 cos φ),
  ρ1 = n T_e cos φ · throttle_min ≤ ‖T‖ ≤ ρ2 = n T_e cos φ · throttle_max. g0 = 9.80665 m/s² (exact,
  3rd CGPM 1901).
  Thrust bounds in z (Açıkmeşe & Ploen 2007, the linearised upper and second-order lower bounds):
      μ1 [1 − (z − z0) + (z − z0)²/2] ≤ σ ≤ μ2 [1 − (z − z0)],  μi = ρi e^{−z0(t)}
      z0(t) = ln(m_wet − α ρ2 t) ≤ z(t) ≤ ln(m_wet − α ρ1 t)
  Modelling choice shared with the product (stated in its program description, not taken from its
  code): once m_wet − α ρ2 t falls below the dry mass, the expansion point is ln m_dry instead, the
  lowest mass the vehicle can have (any expansion point at or below z keeps both bounds inside the
  exact ρ1 e^{−z} ≤ σ ≤ ρ2 e^{−z}). m_wet here is the ignition mass.
  Path constraints: pointing n̂ᵀu ≥ σ cos θ (n̂ = up); glide slope ‖(r − r_land)_xy‖ ≤ (r − r_land)_z
  / tan γ with the apex at the landing point; speed ‖ṙ‖ ≤ V_max; altitude floor r_z ≥ target_z + h_min.
  Boundary: ignition state fixed; r(t_f) = target + (0, 0, gate height), ṙ(t_f) = (0, 0, −gate rate).
  Minimum propellant: maximise z(t_f). Minimum landing error (Blackmore 2010): the landing point's
  horizontal position is free; minimise its horizontal distance to the target.

Discretisation (chosen independently of the product's matrix exponential): N nodes t_k = k Δ, the
control u and σ held constant (ZOH) or linear (FOH) between nodes. The translational map over one
step is obtained from the inertial frame that coincides with the surface frame at the step's start:
a vector b fixed in the surface frame has inertial components R(s) b, R(s) = exp([ω×] s) (Rodrigues'
formula, closed form), and with the specific force f = u + g given in surface-frame components the
inertial motion is plain double integration,
      r_I(Δ) = r0 + v_I0 Δ + ∫₀^Δ (Δ − s) R(s) f(s) ds,   v_I(Δ) = v_I0 + ∫₀^Δ R(s) f(s) ds,
      v_I0 = ṙ0 + ω × r0,   r(Δ) = R(Δ)ᵀ r_I(Δ),   ṙ(Δ) = R(Δ)ᵀ v_I(Δ) − ω × r(Δ).
Differentiating r_I = R r twice gives back exactly r̈ = f − 2ω×ṙ − ω×(ω×r), so this map is the exact
solution of the Blackmore model (no Coriolis factor is typed in here: it follows from the frame
change). The integrals are taken with 12-point Gauss–Legendre quadrature: the integrand is a
polynomial of degree ≤ 2 in s times the entire function R(s), whose Taylor terms beyond degree 21 are
below (|ω|Δ)^22/22! — far below double precision for |ω|Δ < 1. Mass: ż = −ασ integrates exactly
(trapezoid for FOH, rectangle for ZOH).
Constraints are imposed at the nodes. With ZOH the control acting at the last node is the one held
over the last interval (its left limit). Constraints that the boundary values already fix are not
imposed at those nodes (the glide-slope cone and the altitude floor at the first and last node,
speed and mass bounds at the ignition node), which keeps a strict interior for the interior-point
method; the scenarios keep the ignition state inside every constraint.

Job (JSON):  {"id", "planet": {"gravity": [3], "rotationRate": [3]},
              "vehicle": {"wetMass_kg", "dryMass_kg", "isp_s", "engineCount", "thrustPerEngine_N",
                          "cantAngle_deg", "throttleMin", "throttleMax", "pointingLimit_deg" | null},
              "constraints": {"glideSlope_deg" | null, "maxSpeed_mps" | null, "gateHeight_m",
                              "gateDescentRate_mps", "minAltitude_m" | null},
              "ignition": {"position_m": [3], "velocity_mps": [3], "mass_kg"},
              "target_m": [3], "nodes", "hold": "zoh" | "foh",
              "problem": "min-propellant" | "min-landing-error",
              "timeOfFlight_s": t  (fixed)  or  "search": {"lower_s", "upper_s", "grid", "tol_s"},
              "relax": ["upperThrust" | "lowerThrust" | "pointing" | "glideSlope" | "speed" | "altitude" | "rate"],
              optional "vehicle": {"throttleRate_perS"}, "throttleIntervals": [[lo, hi] per interval] (ZOH),
              "bruteForceBands": [[lo, hi], ...] (ZOH, fixed t_f: every assignment enumerated)}
Throttle-rate limit (|dρ/dt| ≤ R, ρ = ‖T‖/F the throttle, F the full net thrust), between nodes:
  |T_{k+1} − T_k| ≤ R F Δ. With T = m σ on a lossless solution, T_{k+1} − T_k = m_{k+1}(σ_{k+1} − σ_k)
  − (m_k − m_{k+1})σ_k; the mass is at most m_max(t) = m_wet − α ρ1 t and the mass lost over a step
  times σ_k is at most α ρ2 Δ · ρ2/m_min(t_{k+1}) (m σ ≤ ρ2 and m ≥ m_min(t) = max(m_wet − α ρ2 t, m_dry)),
  so m_max(t_{k+1}) |σ_{k+1} − σ_k| ≤ R F Δ − α Δ ρ2²/m_min(t_{k+1}) is sufficient and linear.
Forbidden throttle bands with zero-order hold: over interval j the thrust acceleration u_j is constant
  and the mass falls, so the thrust m(t)‖u_j‖ sweeps [m_{j+1} σ_j, m_j σ_j] (lossless). Keeping the
  whole interval inside one allowed throttle interval [lo_j, hi_j] is m_{j+1} σ_j ≥ lo_j F (the same
  second-order lower bound, expanded at t_{j+1}) and m_j σ_j ≤ hi_j F (the linearised upper bound at t_j).
  "bruteForceBands" solves this for EVERY assignment of the N − 1 intervals to the allowed intervals
  between the bands and returns the cheapest (an exhaustive reference for small N).
Result: {"id", "status": "optimal" | "infeasible" | ..., "tolerance", "timeOfFlight_s", "propellant_kg",
         "miss_m", "margins": {...}, "solves", and for a search "failures" (times with neither an answer
         nor a certificate), "atGridEdge", "evaluations": [[t, propellant or null], ...]}
"""
import json
import math
import sys

import numpy as np
from cvxopt import matrix, solvers

G0 = 9.80665
GL_NODES, GL_WEIGHTS = np.polynomial.legendre.leggauss(12)
CONELP_OPTIONS = {"show_progress": False, "maxiters": 200}
# conelp's stopping tolerances (abstol, reltol, feastol), tightest first. CVXOPT's own defaults are
# 1e-7/1e-6/1e-7; conelp occasionally stops with "domain error" at the tightest setting on well-posed
# minimum-landing-error problems with a glide slope, so it is retried once at 1e-8 (the result says
# which tolerance was used).
TOLERANCES = (1e-9, 1e-8, 1e-7)


def cross_matrix(w):
    return np.array([[0.0, -w[2], w[1]], [w[2], 0.0, -w[0]], [-w[1], w[0], 0.0]])


def rotation(w, s):
    """exp([ω×] s) by Rodrigues' formula."""
    rate = float(np.linalg.norm(w))
    if rate == 0.0:
        return np.eye(3)
    k = cross_matrix(np.asarray(w) / rate)
    angle = rate * s
    return np.eye(3) + math.sin(angle) * k + (1.0 - math.cos(angle)) * (k @ k)


def propagate(w, dt, r0, v0, f_start, f_end):
    """Exact state after dt from (r0, v0) under specific force f(s) linear from f_start to f_end."""
    w = np.asarray(w, dtype=float)
    v_inertial = v0 + np.cross(w, r0)
    dr = np.zeros(3)
    dv = np.zeros(3)
    for node, weight in zip(GL_NODES, GL_WEIGHTS):
        s = 0.5 * dt * (node + 1.0)
        f = f_start + (f_end - f_start) * (s / dt)
        rf = rotation(w, s) @ f
        dv += 0.5 * dt * weight * rf
        dr += 0.5 * dt * weight * (dt - s) * rf
    r_inertial = r0 + v_inertial * dt + dr
    v_inertial = v_inertial + dv
    back = rotation(w, dt).T
    r = back @ r_inertial
    v = back @ v_inertial - np.cross(w, r)
    return np.concatenate([r, v])


def step_maps(w, dt, hold):
    """Linear maps of one step: x⁺ = Φ x + Gs u_start + Ge u_end + Gg g (Ge = 0 for ZOH)."""
    z3 = np.zeros(3)
    phi = np.zeros((6, 6))
    for j in range(6):
        e = np.zeros(6)
        e[j] = 1.0
        phi[:, j] = propagate(w, dt, e[:3], e[3:], z3, z3)
    g_start = np.zeros((6, 3))
    g_end = np.zeros((6, 3))
    g_const = np.zeros((6, 3))
    for j in range(3):
        e = np.zeros(3)
        e[j] = 1.0
        g_const[:, j] = propagate(w, dt, z3, z3, e, e)
        if hold == "foh":
            g_start[:, j] = propagate(w, dt, z3, z3, e, z3)
            g_end[:, j] = propagate(w, dt, z3, z3, z3, e)
        else:
            g_start[:, j] = g_const[:, j]
    return phi, g_start, g_end, g_const


class Vehicle:
    def __init__(self, v):
        cant = math.radians(v["cantAngle_deg"])
        full = v["engineCount"] * v["thrustPerEngine_N"] * math.cos(cant)
        self.alpha = 1.0 / (v["isp_s"] * G0 * math.cos(cant))
        self.rho1 = full * v["throttleMin"]
        self.rho2 = full * v["throttleMax"]
        self.dry = v["dryMass_kg"]
        self.full = full
        self.rate = v.get("throttleRate_perS")
        limit = v.get("pointingLimit_deg")
        self.cos_pointing = None if limit is None or limit >= 180 else math.cos(math.radians(limit))


class Program:
    """Constraints on the decision vector η, each an affine expression a·η + c (dense rows):
    equalities a·η + c = 0, orthant rows a·η + c ≥ 0 and cones ‖(a_i·η + c_i)_i‖ ≤ a_0·η + c_0,
    handed to conelp as A η = b and G η + s = h, s ∈ R₊^l × Q^q1 × …."""

    def __init__(self, n):
        self.n = n
        self.eq = []
        self.lin = []
        self.socs = []

    def add_eq(self, a, c):
        self.eq.append((a, c))

    def add_ge(self, a, c):
        self.lin.append((a, c))

    def add_soc(self, top, rest):
        self.socs.append([top] + list(rest))

    def solve(self, cost):
        g_rows = list(self.lin)
        for cone in self.socs:
            g_rows.extend(cone)
        dims = {"l": len(self.lin), "q": [len(cone) for cone in self.socs], "s": []}
        G = matrix(np.array([-a for a, _ in g_rows], dtype=float))
        h = matrix(np.array([[c] for _, c in g_rows], dtype=float))
        A = matrix(np.array([a for a, _ in self.eq], dtype=float))
        b = matrix(np.array([[-c] for _, c in self.eq], dtype=float))
        for key, value in CONELP_OPTIONS.items():
            solvers.options[key] = value
        for i, tol in enumerate(TOLERANCES):
            solvers.options.update({"abstol": tol, "reltol": tol, "feastol": tol})
            try:
                sol = solvers.conelp(matrix(np.asarray(cost, dtype=float)), G, h, dims, A=A, b=b)
                return sol, tol
            except ValueError:
                if i + 1 == len(TOLERANCES):
                    raise


def build_and_solve(job, tf):
    veh = Vehicle(job["vehicle"])
    con = job["constraints"]
    ign = job["ignition"]
    relax = set(job.get("relax", []))
    kind = job.get("problem", "min-propellant")
    N = int(job["nodes"])
    hold = job["hold"]
    dt = tf / (N - 1)
    m0 = float(ign["mass_kg"])
    r0 = np.array(ign["position_m"], dtype=float)
    v0 = np.array(ign["velocity_mps"], dtype=float)
    target = np.array(job["target_m"], dtype=float)
    g = np.array(job["planet"]["gravity"], dtype=float)
    w = np.array(job["planet"]["rotationRate"], dtype=float)
    if m0 - veh.alpha * veh.rho1 * tf <= 0.0:
        # Even the smallest thrust would burn more than the whole vehicle: no trajectory at all.
        return {"status": "infeasible", "timeOfFlight_s": tf, "reason": "minimum-throttle burn exceeds the ignition mass"}

    # Units: acceleration from full thrust at ignition, length from the geometry.
    acc = veh.rho2 / m0
    length = max(100.0, float(np.linalg.norm(r0 - target)))
    vel = length / math.sqrt(length / acc)

    # Decision vector η (the papers' condensed form): thrust accelerations u_j and slacks σ_j of the
    # n_ctrl control values, in units of acc, then the landing error (minimum landing error only).
    n_ctrl = N if hold == "foh" else N - 1
    n = 4 * n_ctrl + (1 if kind == "min-landing-error" else 0)
    err = n - 1 if kind == "min-landing-error" else None

    def u_sel(j):
        """3 × n: physical u_j (m/s²) as a function of η."""
        m = np.zeros((3, n))
        for i in range(3):
            m[i, 3 * j + i] = acc
        return m

    def s_sel(j):
        m = np.zeros(n)
        m[3 * n_ctrl + j] = acc
        return m

    ctrl = lambda k: min(k, n_ctrl - 1)  # ZOH: the last node sees the last interval's hold value

    # States y_k = (r_k, v_k) = X[k] η + x[k] (physical units) and z_k = Zc[k]·η + zc[k].
    phi, gs, ge, gg = step_maps(w, dt, hold)
    X = np.zeros((N, 6, n))
    x = np.zeros((N, 6))
    x[0] = np.concatenate([r0, v0])
    Zc = np.zeros((N, n))
    zc = np.full(N, math.log(m0))
    for k in range(N - 1):
        X[k + 1] = phi @ X[k] + gs @ u_sel(k)
        x[k + 1] = phi @ x[k] + gg @ g
        if hold == "foh":
            X[k + 1] += ge @ u_sel(k + 1)
            Zc[k + 1] = Zc[k] - veh.alpha * dt * (s_sel(k) + s_sel(k + 1)) / 2
        else:
            Zc[k + 1] = Zc[k] - veh.alpha * dt * s_sel(k)

    P = Program(n)
    row = lambda a, c, scale: (a / scale, c / scale)

    # Terminal state: the gate above the target (minimum landing error: only its height).
    gate = target + np.array([0.0, 0.0, con["gateHeight_m"]])
    for i in range(3):
        if kind == "min-propellant" or i == 2:
            P.add_eq(*row(X[N - 1][i], x[N - 1][i] - gate[i], length))
    vf = np.array([0.0, 0.0, -con["gateDescentRate_mps"]])
    for i in range(3):
        P.add_eq(*row(X[N - 1][3 + i], x[N - 1][3 + i] - vf[i], vel))

    # Thrust magnitude slack, thrust bounds in z, pointing, mass bounds.
    z_ref, z_max = [], []
    for k in range(N):
        t = k * dt
        z_ref.append(math.log(max(m0 - veh.alpha * veh.rho2 * t, veh.dry)))
        z_max.append(math.log(m0 - veh.alpha * veh.rho1 * t))
    zero = np.zeros(n)
    for k in range(N):
        j = ctrl(k)
        held = k >= n_ctrl  # ZOH last node: same control as the node before, already constrained
        sk = s_sel(j) / acc
        uk = u_sel(j) / acc
        dz = (Zc[k], zc[k] - z_ref[k])  # δ = z − z0 as an affine expression
        if not held:
            P.add_soc((sk, 0.0), [(uk[i], 0.0) for i in range(3)])
        mu2 = veh.rho2 * math.exp(-z_ref[k]) / acc
        if "upperThrust" not in relax:
            # σ ≤ μ2 (1 − δ)
            P.add_ge(-sk - mu2 * dz[0], mu2 * (1.0 - dz[1]))
        if veh.rho1 > 0 and "lowerThrust" not in relax:
            # μ1 (1 − δ + δ²/2) ≤ σ  ⇔  δ² ≤ q := 2 (σ/μ1 − 1 + δ)  ⇔  ‖(δ, (q − 1)/2)‖ ≤ (q + 1)/2
            mu1 = veh.rho1 * math.exp(-z_ref[k]) / acc
            qa = 2.0 * sk / mu1 + 2.0 * dz[0]
            qc = -2.0 + 2.0 * dz[1]
            P.add_soc((qa / 2, (qc + 1) / 2), [dz, (qa / 2, (qc - 1) / 2)])
        if veh.cos_pointing is not None and "pointing" not in relax and not held:
            P.add_ge(uk[2] - veh.cos_pointing * sk, 0.0)
    for k in range(1, N):
        P.add_ge(Zc[k], zc[k] - z_ref[k])
        P.add_ge(-Zc[k], z_max[k] - zc[k])
    P.add_ge(Zc[N - 1], zc[N - 1] - math.log(veh.dry))

    if veh.rate is not None and "rate" not in relax:
        for k in range(N - 1):
            t1 = (k + 1) * dt
            m_max = m0 - veh.alpha * veh.rho1 * t1
            m_min = max(m0 - veh.alpha * veh.rho2 * t1, veh.dry)
            room = (veh.rate * veh.full * dt - veh.alpha * dt * veh.rho2 ** 2 / m_min) / m_max / acc
            ds = (s_sel(ctrl(k + 1)) - s_sel(ctrl(k))) / acc
            P.add_ge(-ds, room)
            P.add_ge(ds, room)
    intervals = job.get("throttleIntervals")
    if intervals is not None:
        if hold != "zoh" or len(intervals) != n_ctrl:
            raise ValueError("throttleIntervals needs zoh and one [lo, hi] per interval")
        for j, (lo, hi) in enumerate(intervals):
            sj = s_sel(j) / acc
            # upper at the interval's start: σ_j ≤ μ (1 − δ_j), μ = hi F e^{−z0(t_j)}
            mu = hi * veh.full * math.exp(-z_ref[j]) / acc
            P.add_ge(-sj - mu * Zc[j], mu * (1.0 - (zc[j] - z_ref[j])))
            if lo > 0:
                # lower at its end: μ (1 − δ + δ²/2) ≤ σ_j, δ = z_{j+1} − z0(t_{j+1})
                mu = lo * veh.full * math.exp(-z_ref[j + 1]) / acc
                dz = (Zc[j + 1], zc[j + 1] - z_ref[j + 1])
                qa = 2.0 * sj / mu + 2.0 * dz[0]
                qc = -2.0 + 2.0 * dz[1]
                P.add_soc((qa / 2, (qc + 1) / 2), [dz, (qa / 2, (qc - 1) / 2)])

    # State constraints (scaled by length or vel).
    if con.get("glideSlope_deg") is not None and "glideSlope" not in relax:
        cot = 1.0 / math.tan(math.radians(con["glideSlope_deg"]))
        for k in range(1, N - 1):
            if kind == "min-propellant":
                rel = [(X[k][i], x[k][i] - target[i]) for i in range(3)]
            else:
                # apex at the landing point r_{N−1} − (0, 0, gate height), itself a variable
                rel = [(X[k][i] - X[N - 1][i], x[k][i] - x[N - 1][i] + (con["gateHeight_m"] if i == 2 else 0.0)) for i in range(3)]
            P.add_soc(row(cot * rel[2][0], cot * rel[2][1], length), [row(*rel[i], length) for i in range(2)])
    if con.get("maxSpeed_mps") is not None and "speed" not in relax:
        for k in range(1, N):
            P.add_soc((zero, con["maxSpeed_mps"] / vel), [row(X[k][3 + i], x[k][3 + i], vel) for i in range(3)])
    if con.get("minAltitude_m") is not None and "altitude" not in relax:
        for k in range(1, N - 1):
            P.add_ge(*row(X[k][2], x[k][2] - target[2] - con["minAltitude_m"], length))
    cost = np.zeros(n)
    if err is not None:
        e = np.zeros(n)
        e[err] = 1.0
        P.add_soc((e, 0.0), [row(X[N - 1][i], x[N - 1][i] - target[i], length) for i in range(2)])
        cost[err] = 1.0
    else:
        cost = -Zc[N - 1]

    sol, tol = P.solve(cost)
    status = sol["status"]
    out = {"status": {"optimal": "optimal", "primal infeasible": "infeasible"}.get(status, status), "timeOfFlight_s": tf, "tolerance": tol}
    if status != "optimal":
        return out
    eta = np.array(sol["x"]).ravel()
    Y = np.einsum("kin,n->ki", X, eta) + x
    R, V = Y[:, :3], Y[:, 3:]
    Z = Zc @ eta + zc
    U = np.array([u_sel(ctrl(k)) @ eta for k in range(N)])
    S = np.array([s_sel(ctrl(k)) @ eta for k in range(N)])
    out["propellant_kg"] = m0 - math.exp(Z[-1])
    out["miss_m"] = float(np.hypot(R[-1][0] - target[0], R[-1][1] - target[1]))
    out["margins"] = margins(job, veh, con, R, V, Z, U, S, z_ref, target, acc)
    out["mass_kg"] = [math.exp(zk) for zk in Z]
    full = veh.rho2 / job["vehicle"]["throttleMax"]
    out["throttle"] = [math.exp(Z[k]) * float(np.linalg.norm(U[k])) / full for k in range(N)]
    out["altitude_m"] = [float(R[k][2] - target[2]) for k in range(N)]
    return out


def margins(job, veh, con, R, V, Z, U, S, z_ref, target, acc):
    """Smallest slack of each constraint over the nodes where it is imposed (thrust terms relative to
    the full-throttle acceleration at ignition, lengths in m, speeds in m/s)."""
    N = len(Z)
    out = {"losslessGap": max(float(S[k] - np.linalg.norm(U[k])) for k in range(N)) / acc}
    out["upperThrust"] = min(veh.rho2 * math.exp(-z_ref[k]) * (1 - (Z[k] - z_ref[k])) - S[k] for k in range(N)) / acc
    if veh.rho1 > 0:
        out["lowerThrust"] = min(S[k] - veh.rho1 * math.exp(-z_ref[k]) * (1 - (Z[k] - z_ref[k]) + (Z[k] - z_ref[k]) ** 2 / 2) for k in range(N)) / acc
    if veh.cos_pointing is not None:
        out["pointing"] = min(U[k][2] - S[k] * veh.cos_pointing for k in range(N)) / acc
    land = R[-1] - np.array([0.0, 0.0, con["gateHeight_m"]])
    if con.get("glideSlope_deg") is not None:
        cot = 1.0 / math.tan(math.radians(con["glideSlope_deg"]))
        out["glideSlope"] = min((R[k][2] - land[2]) * cot - math.hypot(R[k][0] - land[0], R[k][1] - land[1]) for k in range(1, N - 1))
    if con.get("maxSpeed_mps") is not None:
        out["speed"] = min(con["maxSpeed_mps"] - float(np.linalg.norm(V[k])) for k in range(1, N))
    if con.get("minAltitude_m") is not None:
        out["altitude"] = min(R[k][2] - target[2] - con["minAltitude_m"] for k in range(1, N - 1))
    return out


def cost(job, res):
    if res["status"] != "optimal":
        return math.inf
    return res["miss_m"] if job.get("problem") == "min-landing-error" else res["propellant_kg"]


def search(job):
    """Free final time: a grid over [lower, upper], then golden-section search around the best grid
    point (infeasible times cost +∞). Reaches the local minimum bracketed by the grid to tol_s."""
    spec = job["search"]
    lo, hi, n = spec["lower_s"], spec["upper_s"], int(spec["grid"])
    tol = spec.get("tol_s", 1e-3)
    evals = []

    def f(t):
        try:
            res = build_and_solve(job, t)
        except ValueError as exc:  # conelp gave up at every tolerance: no answer at this time
            res = {"status": "error", "timeOfFlight_s": t, "error": repr(exc)}
        evals.append((t, res))
        return cost(job, res)

    grid = [lo + (hi - lo) * i / (n - 1) for i in range(n)]
    values = [f(t) for t in grid]
    best = min(range(n), key=lambda i: values[i])
    failures = sum(1 for _, res in evals if res["status"] not in ("optimal", "infeasible"))
    if not math.isfinite(values[best]):
        # Infeasible at every grid time (a certificate each, unless counted in "failures").
        return {"status": "infeasible", "solves": len(evals), "failures": failures, "evaluations": [[t, None] for t, _ in evals]}
    a = grid[max(best - 1, 0)]
    b = grid[min(best + 1, n - 1)]
    invphi = (math.sqrt(5) - 1) / 2
    c = b - invphi * (b - a)
    d = a + invphi * (b - a)
    fc, fd = f(c), f(d)
    while b - a > tol:
        if fc <= fd:
            b, d, fd = d, c, fc
            c = b - invphi * (b - a)
            fc = f(c)
        else:
            a, c, fc = c, d, fd
            d = a + invphi * (b - a)
            fd = f(d)
    feasible = [(cost(job, res), t, res) for t, res in evals if res["status"] == "optimal"]
    _, t_best, res = min(feasible, key=lambda e: (e[0], e[1]))
    out = dict(res)
    out["solves"] = len(evals)
    out["failures"] = sum(1 for _, r in evals if r["status"] not in ("optimal", "infeasible"))
    out["atGridEdge"] = best in (0, n - 1)
    out["evaluations"] = [[t, r.get("propellant_kg") if r["status"] == "optimal" else None] for t, r in evals]
    return out


def brute_force_bands(job):
    """Every assignment of the N − 1 hold intervals to the allowed throttle intervals, each solved at the
    job's fixed t_f; the cheapest optimal one wins."""
    import itertools
    v = job["vehicle"]
    allowed, lo = [], v["throttleMin"]
    for a, b in job["bruteForceBands"]:
        allowed.append((lo, a))
        lo = b
    allowed.append((lo, v["throttleMax"]))
    n_int = int(job["nodes"]) - 1
    best, solves, feasible = None, 0, 0
    for combo in itertools.product(range(len(allowed)), repeat=n_int):
        sub = dict(job)
        sub["throttleIntervals"] = [list(allowed[c]) for c in combo]
        try:
            res = build_and_solve(sub, float(job["timeOfFlight_s"]))
        except ValueError:
            res = {"status": "error"}
        solves += 1
        if res["status"] == "optimal":
            feasible += 1
            if best is None or res["propellant_kg"] < best["propellant_kg"]:
                best = dict(res)
                best["assignment"] = list(combo)
    out = best if best is not None else {"status": "infeasible"}
    out["solves"] = solves
    out["feasibleAssignments"] = feasible
    return out


def run(job):
    if "bruteForceBands" in job:
        out = brute_force_bands(job)
        out["id"] = job.get("id")
        return out
    if "search" in job:
        out = search(job)
    else:
        out = build_and_solve(job, float(job["timeOfFlight_s"]))
        out["solves"] = 1
    out["id"] = job.get("id")
    return out


def main():
    jobs = json.load(sys.stdin)
    results = []
    for job in jobs:
        try:
            results.append(run(job))
        except Exception as exc:  # report, never hide
            results.append({"id": job.get("id"), "status": "error", "error": repr(exc)})
    json.dump(results, sys.stdout)


if __name__ == "__main__":
    main()
