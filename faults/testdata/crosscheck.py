#!/usr/bin/env python3
"""An independent numpy/scipy short-circuit computation, the reference that
tripgrade's fault engine (package faults) is cross-checked against.

Usage: crosscheck.py NETWORK.json RESULTS.json

It is written from the documented method (faults/doc.go and the field
documentation of the Network types; IEC 60909-0 for the equivalent voltage
source and the correction factors; Grainger & Stevenson, Power System
Analysis, ch. 11-12 for the sequence networks and fault connections), not
from the Go code, and on purpose takes different routes wherever the method
allows one:

* Transformer phase shifts are kept in the sequence networks as a complex
  off-nominal ratio, e^{+j30h} in the positive and e^{-j30h} in the negative
  sequence, so those admittance matrices are not symmetric and every bus
  carries its true angle (the Go engine rotates each zone back to a
  shift-free frame and rotates the results afterwards).
* A transformer's short-circuit impedance sits on its From winding, in ohms
  on that winding's rated voltage, ahead of the ideal ratio (the Go engine
  puts it on the To side).
* The bus impedance matrices are dense inverses (scipy.linalg.inv) of the
  admittance matrices restricted to the buses that have a path to earth in
  that sequence; the others have an infinite impedance.
* A fault inside a line is solved by inserting the fault node into the
  admittance matrix explicitly and solving for its column with a sparse LU
  (scipy.sparse.linalg.splu; the Go engine uses the bus-impedance building
  rule).
* The fault itself is solved from its phase-domain boundary conditions
  (Va = Zf Ia for a phase-to-earth fault, ...) together with the three
  Thevenin equations, as one small linear system, instead of the closed
  forms of the sequence-network connections.
* The current at a measuring point for a fault close in at its own branch
  terminal comes from Kirchhoff's current law at the bus: minus the sum of
  the currents into every other element there.
* A three-winding transformer is a three-port: its star equivalent (each
  winding pair corrected by its own K_T first) is reduced to a 3x3
  admittance between its terminals (Kron reduction of the star point), with
  the windings' complex ratios applied in SI units; the Go engine keeps the
  star point as an internal bus joined to three two-port branches.
* A power station unit's factor K_S or K_SO is applied to its generator and
  its unit transformer; asynchronous motors are shunt impedances in the
  maximum case only, from their rating by the IEC 60909-0 formulas.

Conventions (faults/doc.go): per unit on the network's base MVA and each
bus's nominal kV; the driving voltage c*Un/sqrt(3) at the fault location
only (IEC 60909-0 equivalent voltage source), c from IEC 60909-0 Table 1 by
the fault bus's voltage level and the case; IEC clock number h: the LV side
lags the HV side by h*30 degrees in the positive sequence; the angle
reference is the pre-fault phase-a voltage at the fault location; a
measuring point's current is positive from its bus into its branch and is
given in that bus's phase frame; results are phase currents Ia, Ib, Ic in
amperes, written as [re_a, im_a, re_b, im_b, re_c, im_c].
"""

import json
import math
import sys

import numpy as np
import scipy.linalg as sla
import scipy.sparse as sps
import scipy.sparse.linalg as spla

# Symmetrical components (Fortescue): a = e^{j120 deg}; phases from
# sequences, rows a, b, c and columns 0, 1, 2.
A = np.exp(2j * np.pi / 3)
SEQ_TO_PHASE = np.array([[1, 1, 1], [1, A * A, A], [1, A, A * A]])

KINDS = ("LLL", "LL", "LG", "LLG")
CASES = ("max", "min")
ZERO, POS, NEG = 0, 1, 2

# IEC 60909-0 Table 1: the low-voltage rows apply up to 1 kV.
LV_LIMIT_KV = 1.0
# IEC 60909-0 minimum-case line resistance: R = [1 + 0.004/K (theta_e - 20)] R20.
ALPHA_PER_K = 0.004


def cx(v):
    """A [re, im] pair as a complex number."""
    return complex(v[0], v[1])


def voltage_factor(kv, case, tol10):
    """IEC 60909-0:2016 Table 1 voltage factor c."""
    if kv > LV_LIMIT_KV:
        return 1.10 if case == "max" else 1.00
    if case == "max":
        return 1.10 if tol10 else 1.05
    return 0.90 if tol10 else 0.95


def with_xr(mag, xr):
    """The impedance of magnitude mag whose X/R is xr."""
    phi = math.atan(xr)
    return mag * complex(math.cos(phi), math.sin(phi))


def parse_group(text):
    """Winding letters of the HV and LV sides and the clock number of an
    IEC 60076-1 vector group such as 'Dyn11'."""
    s = text.strip().lower()
    sides = []
    for _ in range(2):
        for letters, name in (("yn", "YN"), ("y", "Y"), ("d", "D")):
            if s.startswith(letters):
                sides.append(name)
                s = s[len(letters):]
                break
        else:
            raise ValueError("bad vector group %r" % text)
    return sides[0], sides[1], int(s)


def parse_group3(text):
    """Winding letters of the HV, MV and LV windings and the clock numbers
    of MV and LV against HV, of a three-winding group such as 'YNyn0d5'."""
    s = text.strip().lower()
    letters, clocks = [], [0]
    for w in range(3):
        for code, name in (("yn", "YN"), ("y", "Y"), ("d", "D")):
            if s.startswith(code):
                letters.append(name)
                s = s[len(code):]
                break
        else:
            raise ValueError("bad vector group %r" % text)
        if w > 0:
            digits = len(s) - len(s.lstrip("0123456789"))
            clocks.append(int(s[:digits]))
            s = s[digits:]
    return letters, clocks


def motor_impedance(m):
    """IEC 60909-0 asynchronous motor (group): Z_M = U_rM^2 / (I_LR/I_rM
    S_rM), S_rM = P_rM / (eta cos phi), R_M/X_M by voltage and power per
    pair of poles (0.42 low voltage, 0.10 from 1 MW per pair, else 0.15),
    divided by the number of motors; in ohms."""
    s_rm = m["mw"] / (m["efficiency"] * m["pf"])
    z = m["kv"] ** 2 / (m["ilr_irm"] * s_rm) / max(m["count"], 1)
    rx = m["r_x"]
    if rx == 0:
        if m["kv"] <= LV_LIMIT_KV:
            rx = 0.42
        elif m["mw"] / m["pole_pairs"] >= 1:
            rx = 0.10
        else:
            rx = 0.15
    x = z / math.sqrt(1 + rx * rx)
    return complex(rx * x, x)


def earthed_star(letter, neutral):
    return letter == "YN" and not neutral["isolated"]


class Model:
    """The three sequence networks of one case, in per unit, as a list of
    two-port branches (a 2x2 admittance per sequence, None where the branch
    is open in that sequence) and a shunt admittance per bus."""

    def __init__(self, net, case):
        self.net = net
        self.case = case
        st = net["settings"]
        self.tol10 = st["lv_tolerance_10"]
        self.base = net["base_mva"]
        self.kv = np.array([b["kv"] for b in net["buses"]])
        self.nb = len(self.kv)
        self.zbase = self.kv ** 2 / self.base
        self.shunt = np.zeros((3, self.nb), dtype=complex)
        self.branches = []  # dicts: f, t, y (3 x (2x2 or None)), z (line sections)
        # Three-ports: buses, y (3 x (3x3 or None)), ground (3 bools: a path
        # to earth inside); star maps an engine branch index (a winding) to
        # (port, winding).
        self.ports = []
        self.star = {}
        # Power station units: unit transformer index -> generator.
        self.unit_of = {g["unit"]["transformer"]: g for g in net["generators"] if g.get("unit")}
        self.add_sources()
        self.add_generators()
        self.add_motors()
        self.add_lines()
        self.add_transformers()
        self.add_transformers3()
        self.add_earthings()

    def c(self, bus):
        return voltage_factor(self.kv[bus], self.case, self.tol10)

    def add_sources(self):
        for s in self.net["sources"]:
            k = s["bus"]
            st = s[self.case]
            z1 = cx(st["z1_ohm"])
            if z1 == 0:
                # IEC 60909-0 network feeder: |Z_Q| = c U_nQ^2 / S"_kQ.
                z1 = with_xr(self.c(k) * self.kv[k] ** 2 / st["sc_mva"], st["x_r"])
            self.shunt[POS, k] += self.zbase[k] / z1
            self.shunt[NEG, k] += self.zbase[k] / z1
            if s["earthed"]:
                z0 = cx(st["z0_ohm"])
                if z0 == 0:
                    xr0 = s["x0_r0"] if s["x0_r0"] != 0 else z1.imag / z1.real
                    z0 = with_xr(s["z0_z1"] * abs(z1), xr0)
                self.shunt[ZERO, k] += self.zbase[k] / z0

    def add_generators(self):
        for g in self.net["generators"]:
            if not g["in_" + self.case]:
                continue
            k = g["bus"]
            xd = g["xd_pct"] / 100
            x2 = (g["x2_pct"] or g["xd_pct"]) / 100
            x0 = g["x0_pct"] / 100
            r = g["r_pct"] / 100
            if r == 0:
                # IEC 60909-0 fictitious stator resistance.
                if g["kv"] <= LV_LIMIT_KV:
                    r = 0.15 * xd
                elif g["mva"] >= 100:
                    r = 0.05 * xd
                else:
                    r = 0.07 * xd
            kg = 1.0
            if self.case == "max" and g.get("unit"):
                kg = self.unit_factor(g)
            elif self.case == "max" and g["pf"] > 0:
                # IEC 60909-0: K_G = (Un/U_rG) c_max / (1 + x"d sin phi_rG).
                sin_phi = math.sqrt(1 - g["pf"] ** 2)
                kg = self.kv[k] / g["kv"] * self.c(k) / (1 + xd * sin_phi)
            zr = g["kv"] ** 2 / g["mva"]  # ohms per unit of the rating
            z = [kg * complex(r, x) * zr for x in (x0, xd, x2)]
            self.shunt[POS, k] += self.zbase[k] / z[POS]
            self.shunt[NEG, k] += self.zbase[k] / z[NEG]
            if not g["neutral"]["isolated"]:
                self.shunt[ZERO, k] += self.zbase[k] / (z[ZERO] + 3 * cx(g["neutral"]["z_ohm"]))

    def unit_factor(self, g):
        """IEC 60909-0 power station unit: with an on-load tap changer
        K_S = (U_nQ/U_rG)^2 (U_rTLV/U_rTHV)^2 c_max / (1 + |x"d - x_T| sin phi),
        without one K_SO = U_nQ/(U_rG (1 + p_G)) (U_rTLV/U_rTHV) (1 + p_T)
        c_max / (1 + x"d sin phi); U_nQ the nominal voltage at the unit
        transformer's network side."""
        u = g["unit"]
        tr = self.net["transformers"][u["transformer"]]
        if tr["to"] == g["bus"]:
            hv, kv_hv, kv_lv = tr["from"], tr["kv_from"], tr["kv_to"]
        else:
            hv, kv_hv, kv_lv = tr["to"], tr["kv_to"], tr["kv_from"]
        unq = self.kv[hv]
        cmax = voltage_factor(unq, "max", self.tol10)
        x_t = tr["z_pct"] / 100 * math.sin(math.atan(tr["x_r"]))
        xd = g["xd_pct"] / 100
        sin_phi = math.sqrt(1 - g["pf"] ** 2)
        if u["on_load_tap_changer"]:
            return (unq / g["kv"] * kv_lv / kv_hv) ** 2 * cmax / (1 + abs(xd - x_t) * sin_phi)
        return (unq / (g["kv"] * (1 + u["pg_pct"] / 100)) * kv_lv / kv_hv * (1 + u["tap_pct"] / 100)
                * cmax / (1 + xd * sin_phi))

    def add_motors(self):
        if self.case != "max":
            return  # IEC 60909-0: motors are left out of the minimum case
        for m in self.net["motors"]:
            k = m["bus"]
            y = self.zbase[k] / motor_impedance(m)
            self.shunt[POS, k] += y
            self.shunt[NEG, k] += y

    def add_transformers3(self):
        for t in self.net["transformers3"]:
            pi = len(self.ports)
            self.ports.append(self.transformer3(t))
            for w, bi in enumerate(t["branches"]):
                self.star[bi] = (pi, w)

    def transformer3(self, t):
        """A three-winding transformer as a three-port. Pair impedances in
        ohms on the HV winding's rated voltage, each corrected by its own
        K_T = 0.95 c_max / (1 + 0.6 x_T) in the maximum case (c_max of the
        lower of the pair's bus voltages), converted to a star; the star
        point is eliminated: Y_ref = diag(y) - y y^T / sum(y) (plus the
        delta windings' shunts to earth in the zero sequence). A winding's
        voltage referred to the HV side and frame is a_w V_w, a_w =
        (U_rHV/U_rw) e^(+j30 h_w) in the positive sequence (the winding lags
        by 30 h_w) and the conjugate angle in the negative sequence, so the
        terminal currents are conj(a) Y_ref a V."""
        buses, kv = t["buses"], t["kv"]
        kva = kv[0]
        letters, clocks = parse_group3(t["vector_group"])
        pair_windings = ((0, 1), (0, 2), (1, 2))
        p1, p0 = [], []
        for p, pr in enumerate(t["pairs"]):
            zr = kva ** 2 / pr["mva"]
            x = math.sqrt(pr["z_pct"] ** 2 - pr["r_pct"] ** 2)
            z1 = complex(pr["r_pct"], x) * zr / 100
            z0 = z1
            if pr["z0_pct"] > 0:
                z0 = complex(pr["r0_pct"], math.sqrt(pr["z0_pct"] ** 2 - pr["r0_pct"] ** 2)) * zr / 100
            k = 1.0
            if self.case == "max" and not t["not_corrected"]:
                a, b = pair_windings[p]
                cmax = voltage_factor(min(self.kv[buses[a]], self.kv[buses[b]]), "max", self.tol10)
                k = 0.95 * cmax / (1 + 0.6 * x / 100)
            p1.append(k * z1)
            p0.append(k * z0)

        def star(z):
            return [(z[0] + z[1] - z[2]) / 2, (z[0] + z[2] - z[1]) / 2, (z[1] + z[2] - z[0]) / 2]

        s1, s0 = star(p1), star(p0)
        un = np.array([self.kv[b] for b in buses])
        to_pu = np.outer(un, un) / self.base

        def ported(yref, a):
            return np.conj(a)[:, None] * yref * a[None, :] * to_pu

        y = np.array([1 / z for z in s1])
        yref = np.diag(y) - np.outer(y, y) / y.sum()
        ratio = np.array([kva / kv[w] for w in range(3)])
        ang = np.radians(30 * np.array(clocks))
        ys = [None, ported(yref, ratio * np.exp(1j * ang)), ported(yref, ratio * np.exp(-1j * ang))]

        # Zero sequence: earthed star windings join their terminal to the
        # star point through Z0 + 3Zn (referred), delta windings tie the
        # star point to earth through Z0, unearthed stars are open.
        ys0 = np.zeros(3, dtype=complex)
        shunt_s = 0
        for w in range(3):
            nt = t["neutrals"][w]
            if earthed_star(letters[w], nt):
                ys0[w] = 1 / (s0[w] + 3 * cx(nt["z_ohm"]) * ratio[w] ** 2)
            elif letters[w] == "D":
                shunt_s += 1 / s0[w]
        ground = shunt_s != 0
        if ys0.any():
            yref0 = np.diag(ys0) - np.outer(ys0, ys0) / (ys0.sum() + shunt_s)
            ys[ZERO] = ported(yref0, ratio.astype(complex))
        return {"buses": buses, "y": ys, "ground": [ground, False, False]}

    def add_lines(self):
        set_end = self.net["settings"]["end_temp_c"]
        for l in self.net["lines"]:
            f, t = l["from"], l["to"]
            z1, z0 = cx(l["z1_ohm"]), cx(l["z0_ohm"])
            if self.case == "min":
                theta = l["end_temp_c"] or set_end
                if theta != 0:
                    h = 1 + ALPHA_PER_K * (theta - 20)
                    z1 = complex(z1.real * h, z1.imag)
                    z0 = complex(z0.real * h, z0.imag)
            if z0 == 0:
                raise ValueError("line %s without a zero-sequence impedance" % l["name"])
            zs = [z0 / self.zbase[f], z1 / self.zbase[f], z1 / self.zbase[f]]
            ys = [np.array([[1, -1], [-1, 1]]) / z for z in zs]
            self.branches.append({"f": f, "t": t, "y": ys, "z": zs})

    def add_transformers(self):
        for i, tr in enumerate(self.net["transformers"]):
            self.branches.append(self.transformer(tr, self.unit_of.get(i)))

    def transformer(self, tr, unit_gen=None):
        """A two-winding transformer: its impedance in ohms on the From
        winding, in series with an ideal transformer of complex ratio N
        towards the To bus (V_x = N V_to at the internal node x). With I_f
        = (V_f - V_x)/z and lossless ideal transfer, I_to = -conj(N) I_f,
        so Y = [[y, -yN], [-y conj(N), y |N|^2]]."""
        f, t = tr["from"], tr["to"]
        unf, unt = self.kv[f], self.kv[t]
        kvf, kvt = tr["kv_from"], tr["kv_to"]
        kt = 1.0
        if self.case == "max" and unit_gen is not None:
            kt = self.unit_factor(unit_gen)  # the unit's K_S or K_SO, not K_T
        elif self.case == "max" and not tr["not_corrected"]:
            # IEC 60909-0 network transformer: K_T = 0.95 c_max / (1 + 0.6 x_T),
            # c_max of the low-voltage side.
            cmax = voltage_factor(min(unf, unt), "max", self.tol10)
            x_t = tr["z_pct"] / 100 * math.sin(math.atan(tr["x_r"]))
            kt = 0.95 * cmax / (1 + 0.6 * x_t)
        z1_ohm_f = with_xr(kt * tr["z_pct"] / 100 * kvf ** 2 / tr["mva"], tr["x_r"])
        z0_pct = tr["z0_pct"] or tr["z_pct"]
        x0r0 = tr["x0_r0"] or tr["x_r"]
        z0_mag = kt * z0_pct / 100 / tr["mva"]  # times kV^2 gives ohms on that winding
        ratio = (kvf / unf) / (kvt / unt)

        hv_letter, lv_letter, clock = parse_group(tr["vector_group"])
        from_is_hv = kvf >= kvt
        # Angle of the To side's positive-sequence voltage relative to the
        # From side's: the LV side lags by 30h degrees.
        psi = math.radians(-30 * clock if from_is_hv else 30 * clock)

        def two_port(z_pu, n):
            y = 1 / z_pu
            return np.array([[y, -y * n], [-y * np.conj(n), y * abs(n) ** 2]])

        z1 = z1_ohm_f / self.zbase[f]
        ys = [None,
              two_port(z1, ratio * np.exp(-1j * psi)),
              two_port(z1, ratio * np.exp(+1j * psi))]

        wf, wt = (hv_letter, lv_letter) if from_is_hv else (lv_letter, hv_letter)
        ef = earthed_star(wf, tr["neutral_from"])
        et = earthed_star(wt, tr["neutral_to"])
        znf = 3 * cx(tr["neutral_from"]["z_ohm"])
        znt = 3 * cx(tr["neutral_to"]["z_ohm"])
        if ef and et:
            # Series path: both 3Zn referred to the From winding.
            z = with_xr(z0_mag * kvf ** 2, x0r0) + znf + znt * (kvf / kvt) ** 2
            ys[ZERO] = two_port(z / self.zbase[f], ratio)
        elif ef and wt == "D":
            z = with_xr(z0_mag * kvf ** 2, x0r0) + znf
            ys[ZERO] = np.array([[self.zbase[f] / z, 0], [0, 0]], dtype=complex)
        elif et and wf == "D":
            z = with_xr(z0_mag * kvt ** 2, x0r0) + znt
            ys[ZERO] = np.array([[0, 0], [0, self.zbase[t] / z]], dtype=complex)
        return {"f": f, "t": t, "y": ys, "z": None}

    def add_earthings(self):
        for e in self.net["earthings"]:
            k = e["bus"]
            self.shunt[ZERO, k] += self.zbase[k] / (cx(e["z0_ohm"]) + 3 * cx(e["neutral_ohm"]))


def earthed_buses(nb, shunt, branches, ports):
    """Buses with a path to earth (the reference) in one sequence: those in
    a part of the network, connected through series couplings, that holds
    a shunt admittance somewhere. ports are (buses, 3x3 y, ground) of the
    three-ports: coupled terminals join, and a three-port with a path to
    earth inside ties its terminals that see it."""
    parent = list(range(nb))

    def root(x):
        while parent[x] != x:
            parent[x] = parent[parent[x]]
            x = parent[x]
        return x

    tie = shunt != 0
    for f, t, y in branches:
        if y is None:
            continue
        if y[0, 1] != 0 or y[1, 0] != 0:
            parent[root(f)] = root(t)
        else:
            tie[f] |= y[0, 0] != 0
            tie[t] |= y[1, 1] != 0
    for buses, y, ground in ports:
        if y is None:
            continue
        for i in range(3):
            for j in range(i + 1, 3):
                if y[i, j] != 0:
                    parent[root(buses[i])] = root(buses[j])
            if ground and y[i, i] != 0:
                tie[buses[i]] = True
    tied_roots = {root(i) for i in range(nb) if tie[i]}
    return np.array([root(i) in tied_roots for i in range(nb)])


def admittance(nb, shunt, branches, ports):
    y = np.diag(shunt.astype(complex))
    for f, t, yb in branches:
        if yb is None:
            continue
        idx = np.array([f, t])
        y[np.ix_(idx, idx)] += yb
    for buses, yp, _ in ports:
        if yp is None:
            continue
        idx = np.array(buses)
        y[np.ix_(idx, idx)] += yp
    return y


# Fault boundary conditions in the phase domain, with the sequence
# quantities as unknowns x = (I0, I1, I2, V0, V1, V2): each row is
# (coefficients on I, coefficients on V) of one equation = 0. Ia, Ib, Ic
# are SEQ_TO_PHASE rows applied to I, likewise for V. zf is the fault
# impedance (per phase for LLL, between the phases for LL, to earth from
# the faulted phase(s) for LG and LLG, Grainger & Stevenson ch. 12).
def boundary_rows(kind, zf):
    P = SEQ_TO_PHASE
    z3 = np.zeros(3)
    rows = []
    if kind == "LLL":
        for ph in range(3):
            rows.append((-zf * P[ph], P[ph]))  # V_ph = zf I_ph
    elif kind == "LL":
        rows.append((P[0], z3))  # Ia = 0
        rows.append((P[1] + P[2], z3))  # Ib + Ic = 0
        rows.append((-zf * P[1], P[1] - P[2]))  # Vb - Vc = zf Ib
    elif kind == "LG":
        rows.append((P[1], z3))  # Ib = 0
        rows.append((P[2], z3))  # Ic = 0
        rows.append((-zf * P[0], P[0]))  # Va = zf Ia
    else:  # LLG: b and c joined, through zf to earth
        rows.append((P[0], z3))  # Ia = 0
        rows.append((z3, P[1] - P[2]))  # Vb = Vc
        rows.append((-zf * (P[1] + P[2]), P[1]))  # Vb = zf (Ib + Ic)
    return rows


def fault_sequence_currents(kind, e, zth, zf):
    """I0, I1, I2 into the fault from the Thevenin equivalents V_s = E_s -
    Z_s I_s (E only in the positive sequence; zth[s] None: no path, I_s = 0)
    and the fault's boundary conditions, solved as one linear system."""
    if zth[POS] is None:
        return np.zeros(3, dtype=complex)
    m = np.zeros((6, 6), dtype=complex)
    rhs = np.zeros(6, dtype=complex)
    for s in range(3):
        if zth[s] is None:
            m[s, s] = 1  # I_s = 0; V_s is then free
        else:
            m[s, s] = zth[s]  # Z_s I_s + V_s = E_s
            m[s, 3 + s] = 1
            rhs[s] = e if s == POS else 0
    for r, (ci, cv) in enumerate(boundary_rows(kind, zf)):
        m[3 + r, :3] = ci
        m[3 + r, 3:] = cv
    # An open zero sequence makes the LL system rank-deficient in V0 only
    # (Ia = 0 and Ib + Ic = 0 already say I0 = 0); least squares returns the
    # unique currents.
    x = np.linalg.lstsq(m, rhs, rcond=None)[0]
    return x[:3]


class CaseSolver:
    """Bus impedance matrices of one case and the currents of faults."""

    def __init__(self, net, case):
        self.net = net
        self.case = case
        self.model = md = Model(net, case)
        nb = md.nb
        self.nb = nb
        self.ibase = md.base * 1000 / (math.sqrt(3) * md.kv)
        self.seqs = []
        for s in range(3):
            brs = [(b["f"], b["t"], b["y"][s]) for b in md.branches]
            prs = [(p["buses"], p["y"][s], p["ground"][s]) for p in md.ports]
            y = admittance(nb, md.shunt[s], brs, prs)
            g = earthed_buses(nb, md.shunt[s], brs, prs)
            keep = np.flatnonzero(g)
            row = np.full(nb, -1)
            row[keep] = np.arange(len(keep))
            yk = y[np.ix_(keep, keep)]
            # The same matrix bordered by an empty row and column, sparse,
            # for the faults inside lines.
            ysparse = sps.csc_matrix(np.pad(yk, ((0, 1), (0, 1))))
            z = np.zeros((nb, nb), dtype=complex)
            if keep.size:
                z[np.ix_(keep, keep)] = sla.inv(yk)
            self.seqs.append({"earthed": g, "keep": keep, "row": row, "ysparse": ysparse, "z": z})
        self.incident = [[] for _ in range(nb)]
        for bi, b in enumerate(md.branches):
            self.incident[b["f"]].append((bi, 0))
            self.incident[b["t"]].append((bi, 1))
        for bi, (pi, w) in md.star.items():
            self.incident[md.ports[pi]["buses"][w]].append((bi, 0))

    def end_bus(self, bi, end):
        """The bus at end 0 (From) or 1 (To) of engine branch bi; a
        winding of a three-winding transformer has only its terminal."""
        md = self.model
        if bi in md.star:
            pi, w = md.star[bi]
            if end != 0:
                raise ValueError("a point or place at the star point of a three-winding transformer")
            return md.ports[pi]["buses"][w]
        b = md.branches[bi]
        return b["f"] if end == 0 else b["t"]

    def fault_impedance_pu(self, kind, bus):
        """Fault impedance of the case (faults/cases.go Settings and
        solve.go CaseFault): bolted in the maximum case; in the minimum case
        the earth-fault resistance (its LV value up to 1 kV) for LG and LLG
        and the phase-fault resistance for LLL and LL."""
        if self.case == "max":
            return 0
        st = self.net["settings"]
        if kind in ("LLL", "LL"):
            r = st["phase_fault_ohm"]
        elif self.model.kv[bus] <= LV_LIMIT_KV:
            r = st["earth_fault_ohm_lv"]
        else:
            r = st["earth_fault_ohm"]
        return r / self.model.zbase[bus]

    def into_branch(self, s, bi, end, dv):
        """Current of sequence s from the bus at `end` into branch bi for
        bus voltage changes dv (kinds x buses); for a winding of a
        three-winding transformer, the current into its terminal."""
        md = self.model
        if bi in md.star:
            pi, w = md.star[bi]
            port = md.ports[pi]
            y = port["y"][s]
            if y is None:
                return np.zeros(dv.shape[0], dtype=complex)
            return sum(y[w, j] * dv[:, port["buses"][j]] for j in range(3))
        b = md.branches[bi]
        y = b["y"][s]
        if y is None:
            return np.zeros(dv.shape[0], dtype=complex)
        return y[end, 0] * dv[:, b["f"]] + y[end, 1] * dv[:, b["t"]]

    def solve_place(self, place, points):
        """Fault and point phase currents in amperes for the four kinds:
        arrays (4, 3) and (4, npoints, 3)."""
        if place["kind"] == "line":
            return self.solve_line(place, points)
        if place["kind"] == "bus":
            k = place["bus"]
            own = None
        else:
            end = 0 if place["end"] == "from" else 1
            k = self.end_bus(place["branch"], end)
            own = (place["branch"], end)
        zth = [self.seqs[s]["z"][k, k] if self.seqs[s]["earthed"][k] else None for s in range(3)]
        iseq = self.kind_currents(zth, k)
        dv = np.stack([-np.outer(iseq[:, s], self.seqs[s]["z"][:, k]) for s in range(3)])
        ipts = self.point_currents(points, dv)
        if own is not None:
            for n, (bi, end) in enumerate(points):
                if (bi, end) == own:
                    ipts[:, n, :] = self.kcl_close_in(k, bi, dv)
        return self.to_phases(iseq, k, ipts, points)

    def kind_currents(self, zth, k):
        """Sequence fault currents, per unit, (4 kinds, 3)."""
        if not self.seqs[POS]["earthed"][k]:  # not fed in this case
            return np.zeros((4, 3), dtype=complex)
        e = voltage_factor(self.model.kv[k], self.case, self.model.tol10)
        return np.array([fault_sequence_currents(kind, e, zth, self.fault_impedance_pu(kind, k)) for kind in KINDS])

    def point_currents(self, points, dv):
        """Sequence currents (4, npoints, 3) from each point's bus into its
        branch for bus voltage changes dv (3, 4, nb)."""
        out = np.zeros((4, len(points), 3), dtype=complex)
        for n, (bi, end) in enumerate(points):
            for s in range(3):
                out[:, n, s] = self.into_branch(s, bi, end, dv[s])
        return out

    def kcl_close_in(self, k, own, dv):
        """Current through the measuring point of branch `own` at bus k for
        a fault just beyond it: the fault node is the branch terminal, so
        the point carries what the rest of the bus supplies, minus the sum
        of the currents from the bus into every other element there."""
        out = np.zeros((4, 3), dtype=complex)
        for s in range(3):
            tot = self.model.shunt[s, k] * dv[s][:, k]
            for bi, end in self.incident[k]:
                if bi != own:
                    tot = tot + self.into_branch(s, bi, end, dv[s])
            out[:, s] = -tot
        return out

    def solve_line(self, place, points):
        """A fault at fraction p along line bi, with the fault node inserted
        into each admittance matrix: the line is replaced by its sections
        i-f (p z) and f-j ((1-p) z) and the column of f is solved for."""
        md = self.model
        bi, p = place["branch"], place["frac"]
        b = md.branches[bi]
        i, j = b["f"], b["t"]
        nb = self.nb
        cols, zth = [], []
        for s in range(3):
            sq = self.seqs[s]
            col = np.zeros(nb + 1, dtype=complex)
            if not sq["earthed"][i]:
                cols.append(col)
                zth.append(None)
                continue
            keep = sq["keep"]  # earthed buses, in matrix order
            m = len(keep)
            z = b["z"][s]
            ri, rj = sq["row"][i], sq["row"][j]
            # The change from the network's matrix: the line i-j out, the
            # sections i-f and f-j in, f being the new last row.
            yl = b["y"][s]
            ya, yb = 1 / (p * z), 1 / ((1 - p) * z)  # sections i-f and f-j
            rr = [ri, ri, rj, rj, ri, m, ri, m, m, rj, m, rj]
            cc = [ri, rj, ri, rj, ri, ri, m, m, rj, m, m, rj]
            vv = [-yl[0, 0], -yl[0, 1], -yl[1, 0], -yl[1, 1], ya, -ya, -ya, ya, -yb, -yb, yb, yb]
            delta = sps.csc_matrix((vv, (rr, cc)), shape=(m + 1, m + 1))
            y = (sq["ysparse"] + delta).tocsc()
            rhs = np.zeros(m + 1, dtype=complex)
            rhs[m] = 1
            x = spla.splu(y).solve(rhs)
            col[keep] = x[:m]
            col[nb] = x[m]
            cols.append(col)
            zth.append(x[m])
        iseq = self.kind_currents(zth, i)
        dvx = np.stack([-np.outer(iseq[:, s], cols[s]) for s in range(3)])  # (3, 4, nb+1)
        ipts = self.point_currents(points, dvx[:, :, :nb])
        for n, (pb, end) in enumerate(points):
            if pb != bi:
                continue
            node, zsec = (i, p) if end == 0 else (j, 1 - p)
            for s in range(3):
                ipts[:, n, s] = (dvx[s][:, node] - dvx[s][:, nb]) / (zsec * b["z"][s])
        return self.to_phases(iseq, i, ipts, points)

    def to_phases(self, iseq, k, ipts, points):
        fault = iseq @ SEQ_TO_PHASE.T * self.ibase[k]
        buses = [self.end_bus(bi, end) for bi, end in points]
        pts = ipts @ SEQ_TO_PHASE.T * self.ibase[buses][None, :, None] if points else ipts
        return fault, pts


def flat(arr):
    """Complex array (..., 3) as nested lists of [re, im] * 3."""
    a = np.ascontiguousarray(arr)
    return a.view(np.float64).tolist()


def main(argv):
    if len(argv) != 3:
        sys.stderr.write("usage: crosscheck.py NETWORK.json RESULTS.json\n")
        return 2
    with open(argv[1]) as f:
        net = json.load(f)
    nl = len(net["lines"])
    pts = [(p["branch"], 0 if p["end"] == "from" else 1) for p in net["points"]]
    solvers = [CaseSolver(net, cs) for cs in CASES]
    out = []
    for pl in net["places"]:
        if pl["kind"] == "line" and pl["branch"] >= nl:
            raise ValueError("line fault on a transformer branch")
        mine = [pts[n] for n in pl["points"]]
        res = {"fault": [], "points": []}
        for sv in solvers:
            fault, at = sv.solve_place(pl, mine)
            res["fault"].append(flat(fault))
            res["points"].append(flat(at.reshape(4, len(mine), 3)))
        out.append(res)
    with open(argv[2], "w") as f:
        json.dump({"places": out}, f)
    return 0


if __name__ == "__main__":
    sys.exit(main(sys.argv))
