#!/usr/bin/env python3
"""Hand figures for tripgrade's direction and discrimination tests.

Usage: handcheck.py            print every figure as JSON {key: number}
       handcheck.py --go       print the same figures as the Go table that
                               coord/handfigures_test.go embeds:
           python3 testdata/discrimination/handcheck.py --go | gofmt > coord/handfigures_test.go

The Go tests (coord/direction_test.go, coord/discrimination_test.go) embed
these figures as constants and, when Python with numpy is available, run
this script and compare its output with the constants (coord/handcheck_test.go),
so that neither drifts.

Every network is written out below from the study files' own data
(testdata/discrimination/*.toml), not read from them and not from the Go
engine, and solved here by symmetrical components on a different route:
dense bus admittance matrices in per unit with the fault point inserted as
a node of its own, numpy inverses, the fault connections of the sequence
networks, and the relay logic written from its textbook description.

Sources, named beside each use:
* Symmetrical components and the fault connections of the sequence networks
  (LLL, LL b-c, LG a-earth, LLG b-c-earth): Grainger & Stevenson, Power
  System Analysis (1994), ch. 11-12.
* Bus voltages during a fault, V = Vpre - Z_kf*I_f per sequence, and branch
  currents from them: the bus impedance method, same chapters.
* IEC 60909-0:2016: the equivalent voltage source c*Un/sqrt(3) at the fault
  (Table 1: c_max 1.10, c_min 1.00 above 1 kV), every bus at that pre-fault
  voltage; the network-transformer correction K_T = 0.95*c_max/(1 + 0.6*x_T)
  and the generator correction K_G = (Un/U_rG)*c_max/(1 + x"d*sin(phi_rG))
  in the maximum case (applied to every sequence impedance of the element
  but not to a neutral earthing impedance: from memory of the standard).
* Delta-star phase shift: IEC clock number 11 (Dyn11), the LV side leading
  the HV side by 30 degrees in the positive sequence, by -30 degrees in the
  negative sequence; zero sequence not shifted and not passed through the
  delta (any power-systems textbook, e.g. Grainger & Stevenson ch. 11).
* IEC 60255-151:2009 standard inverse: t = TMS*0.14/((I/Is)^0.02 - 1).
* Directional elements (from memory of the common protection references,
  e.g. the Network Protection & Automation Guide ch. 9-10): a phase element
  compares its phase current with the quadrature (90-degree connected)
  line voltage (Ia with Vbc, Ib with Vca, Ic with Vab); a ground element
  compares 3I0 with -3V0. Each operates forward when the torque
  |V||I|cos(angle(I) - angle(V) - RCA) is positive, reverse when it is
  negative, RCA the characteristic angle (tripgrade's defaults: 45 degrees
  phase, -45 degrees ground). Below the minimum polarising voltage the
  element does not decide, except that a phase element with voltage memory
  decides with the pre-fault voltage (tripgrade's documented assumption).
* A relay whose current changes in steps integrates dt/t(I) and trips when
  the sum reaches one (the usual model of an inverse timer under a varying
  current, from memory; the checker states the same assumption in
  coord/sequence.go); it resets at once when its current falls below
  pickup. The devices that must clear a fault open in time order and the
  network is solved again after each opening (the sequential clearing of
  tripgrade's design).
"""

import cmath
import json
import math
import sys

import numpy as np

# Symmetrical components (Fortescue): a = e^{j120 deg}; rows a, b, c,
# columns 0, 1, 2.
A = cmath.exp(2j * math.pi / 3)
SEQ_TO_PHASE = np.array([[1, 1, 1], [1, A * A, A], [1, A, A * A]])

BASE_MVA = 100.0
C_MAX, C_MIN = 1.10, 1.00  # IEC 60909-0 Table 1, above 1 kV
MAX, MIN = "max", "min"
KINDS = ["LLL", "LL", "LG", "LLG"]
OUT = {}


def put(key, value):
    if isinstance(value, bool):
        value = 1.0 if value else 0.0
    if not math.isfinite(value):
        raise ValueError(f"{key}: non-finite {value}")
    if key in OUT:
        raise KeyError(f"duplicate key {key}")
    OUT[key] = float(value)


def polar_xr(mag, xr):
    """An impedance of magnitude mag and ratio X/R."""
    r = mag / math.sqrt(1 + xr * xr)
    return complex(r, r * xr)


def k_t(z_pct, xr):
    """IEC 60909-0 network-transformer correction K_T."""
    x_t = z_pct / 100 * xr / math.sqrt(1 + xr * xr)
    return 0.95 * C_MAX / (1 + 0.6 * x_t)


def k_g(un_kv, ur_kv, xd_pct, pf):
    """IEC 60909-0 generator correction K_G."""
    return un_kv / ur_kv * C_MAX / (1 + xd_pct / 100 * math.sqrt(1 - pf * pf))


# ----------------------------------------------------------------- network


class Network:
    """Buses, shunts and branches of one case, impedances in ohms at the
    element's own voltage."""

    def __init__(self):
        self.buses = []  # (name, kv, zone angle in degrees)
        self.bus = {}
        self.shunts = []  # (bus, z1, z2, z0): None for no path in a sequence
        self.branches = {}  # name -> dict

    def add_bus(self, name, kv, zone_deg=0.0):
        self.bus[name] = len(self.buses)
        self.buses.append((name, kv, zone_deg))

    def shunt(self, bus, z1, z2, z0):
        self.shunts.append((self.bus[bus], z1, z2, z0))

    def line(self, name, a, b, z1, z0):
        self.branches[name] = dict(kind="line", ends=(self.bus[a], self.bus[b]), z1=z1, z0=z0)

    def dyn(self, name, hv, lv, z1, z0, zn):
        """A Dyn11 transformer, impedances in ohms at its LV voltage: the
        positive and negative sequence see z1 in series; the zero sequence
        sees the earthed LV star as a shunt z0 + 3*zn at the LV terminal and
        nothing through the delta."""
        self.branches[name] = dict(kind="dyn", ends=(self.bus[hv], self.bus[lv]), z1=z1, z0=z0, zn=zn)

    def kv(self, k):
        return self.buses[k][1]


class Solved:
    """One fault solved in one network state."""


def solve(net, place, kind, case, zf_ohm=0.0, opened=()):
    """Solves a fault of kind at place ('bus', name) or ('branch', name,
    frac) in case, with the fault impedance zf_ohm, in the network with the
    branch ends in opened ((branch, 0 | 1): 0 its first bus, 1 its second)
    open. Returns a Solved with the currents at every branch end in amperes
    (positive from the bus into the branch, in the bus's phase frame), the
    phase voltages and pre-fault voltages of every bus in volts, and the
    neutral current of every Dyn transformer; energised is False when no
    source feeds the fault."""
    nb = len(net.buses)
    nodes = list(range(nb))  # node -> bus whose voltage level it has
    terminals = {}  # (branch, end) -> node

    def new_node(level_bus):
        nodes.append(level_bus)
        return len(nodes) - 1

    for name, br in net.branches.items():
        for e in (0, 1):
            if (name, e) in opened:
                terminals[(name, e)] = new_node(br["ends"][e])
            else:
                terminals[(name, e)] = br["ends"][e]
    # The fault node, and the series segments of each branch.
    segments = []  # (branch, node x, node y, share of the branch)
    if place[0] == "bus":
        f = net.bus[place[1]]
        for name in net.branches:
            segments.append((name, terminals[(name, 0)], terminals[(name, 1)], 1.0))
    else:
        _, fb, frac = place
        for name in net.branches:
            x, y = terminals[(name, 0)], terminals[(name, 1)]
            if name != fb:
                segments.append((name, x, y, 1.0))
            elif frac == 0:
                f = x
                segments.append((name, x, y, 1.0))
            elif frac == 1:
                f = y
                segments.append((name, x, y, 1.0))
            else:
                f = new_node(net.branches[name]["ends"][0])
                segments.append((name, x, f, frac))
                segments.append((name, f, y, 1 - frac))
    n = len(nodes)
    zbase = [net.kv(nodes[i]) ** 2 / BASE_MVA for i in range(n)]
    ibase = [BASE_MVA * 1e6 / (math.sqrt(3) * net.kv(nodes[i]) * 1e3) for i in range(n)]
    vbase = [net.kv(nodes[i]) * 1e3 / math.sqrt(3) for i in range(n)]

    # Admittance matrices per sequence (0, 1, 2), per unit.
    Y = [np.zeros((n, n), complex) for _ in range(3)]
    has_shunt = [np.zeros(n, bool) for _ in range(3)]
    edges = [[] for _ in range(3)]
    for bus, z1, z2, z0 in net.shunts:
        for q, z in ((1, z1), (2, z2), (0, z0)):
            if z is not None:
                Y[q][bus, bus] += zbase[bus] / z
                has_shunt[q][bus] = True
    series = {}  # (branch, x, y) -> per-unit impedance per sequence
    for name, x, y, share in segments:
        br = net.branches[name]
        # Lines are in ohms at their own voltage, a transformer in ohms at
        # its LV voltage (its second end).
        zb = zbase[terminals[(name, 1)]] if br["kind"] == "dyn" else zbase[x]
        zs = {1: br["z1"] * share / zb, 2: br["z1"] * share / zb}
        if br["kind"] == "line":
            zs[0] = br["z0"] * share / zb
        for q, z in zs.items():
            Y[q][x, x] += 1 / z
            Y[q][y, y] += 1 / z
            Y[q][x, y] -= 1 / z
            Y[q][y, x] -= 1 / z
            edges[q].append((x, y))
        series[(name, x, y)] = zs
    for name, br in net.branches.items():
        if br["kind"] == "dyn":
            lv = terminals[(name, 1)]
            y0 = zbase[lv] / (br["z0"] + 3 * br["zn"])
            Y[0][lv, lv] += y0
            has_shunt[0][lv] = True

    # Nodes with no path to earth in a sequence have an infinite impedance
    # there: they are left out of that sequence's matrix.
    def live(q):
        parent = list(range(n))

        def find(i):
            while parent[i] != i:
                parent[i] = parent[parent[i]]
                i = parent[i]
            return i

        for x, y in edges[q]:
            parent[find(x)] = find(y)
        rooted = {find(i) for i in range(n) if has_shunt[q][i]}
        return [i for i in range(n) if find(i) in rooted]

    Z = []
    rows = []
    for q in range(3):
        keep = live(q)
        Zq = np.zeros((n, n), complex)
        if keep:
            Zq[np.ix_(keep, keep)] = np.linalg.inv(Y[q][np.ix_(keep, keep)])
        Z.append(Zq)
        rows.append(set(keep))
    s = Solved()
    s.energised = f in rows[1]
    if not s.energised:
        return s
    open_q = [f not in rows[q] for q in range(3)]
    zff = [Z[q][f, f] for q in range(3)]
    fbus = nodes[f]
    c = C_MAX if case == MAX else C_MIN
    zf = zf_ohm / zbase[f]
    # Fault connections (Grainger & Stevenson ch. 12).
    i0 = i1 = i2 = 0j
    if kind == "LLL":
        i1 = c / (zff[1] + zf)
    elif kind == "LL":
        i1 = c / (zff[1] + zff[2] + zf)
        i2 = -i1
    elif kind == "LG":
        if not open_q[0]:
            i1 = c / (zff[1] + zff[2] + zff[0] + 3 * zf)
            i2 = i0 = i1
    elif kind == "LLG":
        if open_q[0]:
            i1 = c / (zff[1] + zff[2])
            i2 = -i1
        else:
            z0 = zff[0] + 3 * zf
            i1 = c / (zff[1] + zff[2] * z0 / (zff[2] + z0))
            i2 = -i1 * z0 / (zff[2] + z0)
            i0 = -i1 * zff[2] / (zff[2] + z0)
    iseq = [i0, i1, i2]
    s.fault_a = np.abs(SEQ_TO_PHASE @ (np.array(iseq) * ibase[f])).max()

    def v_node(i):
        """Sequence voltages of node i, per unit, in the fault's frame."""
        v = [0j, c + 0j, 0j]
        for q in range(3):
            if i in rows[q]:
                v[q] -= Z[q][i, f] * iseq[q]
        return v

    def rot(bus):
        """Rotation of the positive sequence from the fault's frame to the
        bus's frame."""
        return cmath.exp(1j * math.radians(net.buses[bus][2] - net.buses[fbus][2]))

    def to_bus_frame(seq, bus):
        r = rot(bus)
        return np.array([seq[0], seq[1] * r, seq[2] * r.conjugate()])

    s.v = {}
    s.pre = {}
    for k, (name, _, _) in enumerate(net.buses):
        vb = vbase[k]
        s.v[name] = SEQ_TO_PHASE @ (to_bus_frame(v_node(k), k) * vb)
        s.pre[name] = SEQ_TO_PHASE @ (to_bus_frame([0, c, 0], k) * vb)
    s.i = {}
    s.neutral = {}
    for name, br in net.branches.items():
        for e in (0, 1):
            if (name, e) in opened:
                s.i[(name, e)] = np.zeros(3, complex)
                continue
            x = terminals[(name, e)]
            # The segment of this branch at node x.
            seq = [0j, 0j, 0j]
            for (bn, sx, sy), zs in series.items():
                if bn != name or x not in (sx, sy):
                    continue
                other = sy if x == sx else sx
                vx, vo = v_node(x), v_node(other)
                for q, z in zs.items():
                    seq[q] += (vx[q] - vo[q]) / z
            if br["kind"] == "dyn" and e == 1:
                seq[0] += v_node(x)[0] * zbase[x] / (br["z0"] + 3 * br["zn"])
            # A fault close in at this end, beyond the CT: Kirchhoff's law at
            # the fault node adds the fault's own current.
            if place[0] == "branch" and place[1] == name and place[2] == e and x == f:
                seq = [seq[q] + iseq[q] for q in range(3)]
            bus = br["ends"][e]
            s.i[(name, e)] = SEQ_TO_PHASE @ (to_bus_frame(seq, bus) * ibase[x])
        if br["kind"] == "dyn":
            lv = terminals[(name, 1)]
            v0 = v_node(lv)[0]
            # From earth into the star point: -3V0/(Z0 + 3Zn).
            s.neutral[name] = -3 * v0 * zbase[lv] / (br["z0"] + 3 * br["zn"]) * ibase[lv]
    s.flow = {}
    for key in s.i:
        name, e = key
        x = terminals[key]
        # Share of the fault's positive-sequence current that flows from the
        # bus into the branch (fault frame), for "which sides feed".
        seq1 = 0j
        for (bn, sx, sy), zs in series.items():
            if bn != name or x not in (sx, sy) or key in opened:
                continue
            other = sy if x == sx else sx
            seq1 += (v_node(x)[1] - v_node(other)[1]) / zs[1]
        if place[0] == "branch" and place[1] == name and place[2] == e and x == f:
            seq1 += iseq[1]
        s.flow[key] = seq1 / iseq[1] if iseq[1] != 0 else 0j
    return s


# ------------------------------------------------------------------ relays


def torque_dir(op, pol, rca_deg):
    """+1 forward, -1 reverse, 0 no decision: the sign of
    |V||I|cos(angle(I) - angle(V) - RCA)."""
    if op == 0 or pol == 0:
        return 0, 0.0
    t = (op * pol.conjugate() * cmath.exp(-1j * math.radians(rca_deg))).real
    ang = math.degrees(cmath.phase(op) - cmath.phase(pol)) - rca_deg
    ang = (ang + 180) % 360 - 180
    return (1 if t > 0 else -1 if t < 0 else 0), ang


QUADRATURE = [(1, 2), (2, 0), (0, 1)]  # Ia-Vbc, Ib-Vca, Ic-Vab


class Relay:
    """A relay at one end of a branch: its stages (quantity "phase" or
    "ground", direction "non", "fwd" or "rev", and a curve), its breaker
    time, an optional neutral CT (a Dyn transformer whose neutral current
    its ground stages measure), and its directional element settings
    (tripgrade's defaults)."""

    def __init__(self, name, branch, end, kv, stages, breaker_s, neutral_ct=None,
                 phase_rca=45.0, ground_rca=-45.0, phase_min_pct=1.0, ground_min_pct=2.0, memory=True):
        self.name, self.branch, self.end, self.kv = name, branch, end, kv
        self.stages = stages  # (quantity, direction, curve tuple)
        self.breaker_s = breaker_s
        self.neutral_ct = neutral_ct
        self.phase_rca, self.ground_rca = phase_rca, ground_rca
        self.phase_min_v = phase_min_pct / 100 * kv * 1e3
        self.ground_min_v = ground_min_pct / 100 * kv * 1e3 / math.sqrt(3)
        self.memory = memory
        self.directional = any(st[1] != "non" for st in stages)

    def seen(self, s, bus):
        i = s.i[(self.branch, self.end)]
        return dict(I=i, V=s.v[bus], Pre=s.pre[bus],
                    N=s.neutral[self.neutral_ct] if self.neutral_ct else None)

    def phase_dirs(self, sn):
        out = []
        for p, (x, y) in enumerate(QUADRATURE):
            pol = sn["V"][x] - sn["V"][y]
            memory = False
            if abs(pol) < self.phase_min_v:
                if not self.memory:
                    out.append((0, 0.0, False))
                    continue
                pol = sn["Pre"][x] - sn["Pre"][y]
                memory = True
            d, ang = torque_dir(sn["I"][p], pol, self.phase_rca)
            out.append((d, ang, memory))
        return out

    def ground_dir(self, sn):
        op = sn["I"].sum()
        pol = -sn["V"].sum()
        if abs(pol) < self.ground_min_v:
            return 0, 0.0
        return torque_dir(op, pol, self.ground_rca)

    def quantities(self, sn):
        phase = np.abs(sn["I"])
        ground = abs(sn["N"]) if self.neutral_ct else abs(sn["I"].sum())
        pd = [d for d, _, _ in self.phase_dirs(sn)] if self.directional else [0, 0, 0]
        gd = self.ground_dir(sn)[0] if self.directional else 0
        q = {}
        q[("phase", "non")] = phase.max()
        q[("phase", "fwd")] = max([phase[p] for p in range(3) if pd[p] == 1], default=0.0)
        q[("phase", "rev")] = max([phase[p] for p in range(3) if pd[p] == -1], default=0.0)
        q[("ground", "non")] = ground
        q[("ground", "fwd")] = ground if gd == 1 else 0.0
        q[("ground", "rev")] = ground if gd == -1 else 0.0
        return q

    def group_time(self, sn, quantity):
        q = self.quantities(sn)
        best = math.inf
        for qty, direction, curve in self.stages:
            if qty == quantity:
                best = min(best, stage_time(curve, q[(qty, direction)]))
        return best

    def time(self, sn):
        return min(self.group_time(sn, "phase"), self.group_time(sn, "ground"))

    def governing(self, sn):
        """The current that sets the relay's time: its largest phase
        current, or what its ground stages measure when they are faster."""
        has_ground = any(st[0] == "ground" for st in self.stages)
        has_phase = any(st[0] == "phase" for st in self.stages)
        ground = abs(sn["N"]) if self.neutral_ct else abs(sn["I"].sum())
        if has_ground and (not has_phase or self.group_time(sn, "ground") < self.group_time(sn, "phase")):
            return ground
        return np.abs(sn["I"]).max()


def default_element(branch, end, kv):
    """A relay with the default directional element settings, for asking
    which way a non-directional relay's current flows."""
    return Relay("-", branch, end, kv, [("phase", "fwd", si(1, 1))], 0)


def si(pickup, tms):
    return ("si", pickup, tms)


def dt(pickup, delay):
    return ("dt", pickup, delay)


def stage_time(curve, current):
    kind, pickup, x = curve
    if not current > pickup:
        return math.inf
    if kind == "si":
        # IEC 60255-151:2009 standard inverse.
        return x * 0.14 / ((current / pickup) ** 0.02 - 1)
    return x


# ------------------------------------------------------ sequential clearing


class Fault:
    def __init__(self, net_of, place, kind, case, zf_ohm=0.0):
        self.net_of, self.place, self.kind, self.case, self.zf = net_of, place, kind, case, zf_ohm

    def solve(self, opened=()):
        return solve(self.net_of(self.case), self.place, self.kind, self.case, self.zf, opened)


def bus_of(net, relay):
    return net.buses[net.branches[relay.branch]["ends"][relay.end]][0]


def clear_sequence(fault, relays, sides, margin_s=0.3):
    """Follows a fault fed from the ends of its element: sides lists, per
    end of the faulted element, the point through which that end feeds it
    and the chain of relays from the nearest outwards; in each network
    state the relay that must clear a side is the first of its chain that
    operates, on every side still feeding the fault. Returns the isolation
    time, the openings (relay, time, current at opening, intact current)
    and, per other relay, its worst margin over the relay that must clear
    (unwanted trips and reliefs, as the design describes)."""
    net = fault.net_of(fault.case)
    by = {r.name: r for r in relays}
    opened = set()
    state = fault.solve()

    def seen_all(st):
        return {r.name: r.seen(st, bus_of(net, r)) for r in relays if (r.branch, r.end) not in opened}

    sn = seen_all(state)
    size0 = state.fault_a
    first_a = {name: by[name].governing(x) for name, x in sn.items()}
    prog = {r.name: 0.0 for r in relays}
    prog_up = {r.name: 0.0 for r in relays}  # not capped at one
    trip_at = {}
    T = 0.0
    events = []
    records = {}  # relay -> (margin, other)

    def offer(name, margin, other, d_a, d_s, m_a, m_s):
        # The first of equal margins stays (as the checker keeps it).
        if name not in records or margin < records[name][0]:
            records[name] = (margin, other, d_a, d_s, m_a, m_s)

    for _ in range(20):
        times = {name: by[name].time(x) for name, x in sn.items()}
        must = []
        for feed_point, chain in sides:
            if feed_point in opened or (feed_point[0], feed_point[1]) not in state.flow:
                continue
            if state.flow[feed_point].real <= 1e-6:
                continue
            for name in chain:
                if (by[name].branch, by[name].end) in opened:
                    break
                if math.isfinite(times.get(name, math.inf)):
                    must.append(name)
                    break
        cands = []
        for name in must:
            if name in trip_at:
                cands.append(max(T, trip_at[name] + by[name].breaker_s))
            else:
                cands.append(T + (1 - prog[name]) * times[name] + by[name].breaker_s)
        if not cands:
            return math.inf, events, records
        next_t = min(cands)
        proj = {name: T + (1 - prog_up[name]) * times[name] for name in times
                if name not in must and math.isfinite(times[name])}
        for name, t in times.items():
            prog_up[name] = prog_up[name] + (next_t - T) / t if math.isfinite(t) else 0.0
            if name in trip_at:
                continue
            if not math.isfinite(t):
                prog[name] = 0.0
                continue
            p = prog[name] + (next_t - T) / t
            if p >= 1 - 1e-12:
                trip_at[name] = T + (1 - prog[name]) * t
                prog[name] = 1.0
                if name not in must:
                    m = min(must, key=lambda d: trip_at.get(d, T + (1 - prog[d]) * times[d]))
                    m_t = trip_at.get(m, T + (1 - prog[m]) * times[m])
                    offer(name, trip_at[name] - m_t, m, by[name].governing(sn[name]), trip_at[name],
                          by[m].governing(sn[m]), m_t)
            else:
                prog[name] = p
        now = [name for name in must if name in trip_at and trip_at[name] + by[name].breaker_s <= next_t * (1 + 1e-12) + 1e-12]
        for name in now:
            r = by[name]
            opened.add((r.branch, r.end))
            events.append((name, next_t, r.governing(sn[name]), first_a[name]))
        first = min(now, key=lambda d: [r.name for r in relays].index(d))
        T = next_t
        state = fault.solve(tuple(opened))
        isolated = not state.energised or state.fault_a <= 1e-9 * size0
        sn_new = {} if isolated else seen_all(state)
        for name, p in proj.items():
            if name == first:
                continue
            still = name in sn_new and math.isfinite(by[name].time(sn_new[name]))
            if not still:
                offer(name, p - trip_at[first], first, by[name].governing(sn[name]), p,
                      by[first].governing(sn[first]), trip_at[first])
        if isolated:
            return T, events, records
        sn = sn_new
    raise RuntimeError("sequence did not end")


def place_name(place):
    if place[0] == "bus":
        return place[1]
    return f"{place[1]}@{place[2]:g}"


def put_seen(prefix, relay, sn):
    """The phasor figures a direction decision rests on."""
    for p, (d, ang, mem) in enumerate(relay.phase_dirs(sn)):
        ph = "abc"[p]
        put(f"{prefix}.I{ph}", abs(sn["I"][p]))
        put(f"{prefix}.dir{ph}", d)
        put(f"{prefix}.ang{ph}", ang)
        put(f"{prefix}.mem{ph}", mem)
    put(f"{prefix}.Vbc", abs(sn["V"][1] - sn["V"][2]))
    put(f"{prefix}.3I0", abs(sn["I"].sum()))
    put(f"{prefix}.3V0", abs(sn["V"].sum()))
    d, ang = relay.ground_dir(sn)
    put(f"{prefix}.dirN", d)
    put(f"{prefix}.angN", ang)
    put(f"{prefix}.t", relay.time(sn) if math.isfinite(relay.time(sn)) else -1)


# ------------------------------------------------------------- the studies

# testdata/discrimination/direction-solid.toml and direction-resistance.toml


def two_source_line(earthing):
    def build(case):
        n = Network()
        for b in ("WEST", "MID", "EAST"):
            n.add_bus(b, 11)
        w = complex(0.06, 0.6) if case == MAX else complex(0.12, 1.2)
        e = complex(0.12, 1.2) if case == MAX else complex(0.24, 2.4)
        if earthing == "solid":
            n.shunt("WEST", w, w, complex(0.15, 0.9))
            n.shunt("EAST", e, e, complex(0.3, 1.5))
        else:
            n.shunt("WEST", w, w, None)
            n.shunt("EAST", e, e, None)
            # Zig-zag earthing transformers: Z0 + 3Zn to earth.
            n.shunt("WEST", None, None, complex(3 * 6.35, 1.0))
            n.shunt("EAST", None, None, complex(3 * 12.7, 1.0))
        n.line("LW", "WEST", "MID", complex(0.25, 0.2), complex(1.52, 0.7))
        n.line("LE", "MID", "EAST", complex(2.16, 2.8), complex(3.36, 10.4))
        return n
    return build


def direction_relay(**kw):
    return Relay("R", "LE", 0, 11, [
        ("phase", "fwd", si(300, 0.1)), ("phase", "rev", dt(300, 1.0)),
        ("ground", "fwd", si(10, 0.1)), ("ground", "rev", dt(10, 1.5))], 0.06, **kw)


def direction_cases():
    for earthing in ("solid", "resistance"):
        build = two_source_line(earthing)
        r = direction_relay()
        for way, place in (("fwd", ("bus", "EAST")), ("rev", ("bus", "WEST"))):
            for kind in KINDS:
                s = solve(build(MAX), place, kind, MAX)
                put_seen(f"dir.{earthing}.{way}.{kind}", r, r.seen(s, "MID"))
        # Close-in three-phase faults: the voltage at MID collapses.
        for way, place in (("fwd", ("branch", "LE", 0)), ("rev", ("bus", "MID"))):
            s = solve(build(MAX), place, "LLL", MAX)
            put_seen(f"dir.{earthing}.closein.{way}", r, r.seen(s, "MID"))
            nm = direction_relay(memory=False)
            put_seen(f"dir.{earthing}.closein.{way}.nomemory", nm, nm.seen(s, "MID"))
    # A high-resistance earth fault (40 ohm, the study's minimum case) at
    # EAST on the solidly earthed line: 3V0 at MID is below the default 2 %.
    build = two_source_line("solid")
    s = solve(build(MIN), ("bus", "EAST"), "LG", MIN, 40.0)
    put_seen("dir.solid.highres", direction_relay(), direction_relay().seen(s, "MID"))
    low = direction_relay(ground_min_pct=0.5)
    put_seen("dir.solid.highres.lowmin", low, low.seen(s, "MID"))


# testdata/discrimination/generator-feeder.toml


def generator_feeder(case):
    n = Network()
    for b in ("BF-11", "AV-1", "GN-1"):
        n.add_bus(b, 11)
    g = complex(0.05, 0.5) if case == MAX else complex(0.1, 1.0)
    n.shunt("BF-11", g, g, complex(0.1, 0.6))
    if case == MAX:  # always_running = false: out of the minimum case
        zr = 11 ** 2 / 4
        kg = k_g(11, 11, 15, 0.85)
        n.shunt("GN-1", kg * complex(1, 15) / 100 * zr, kg * complex(1, 17) / 100 * zr, None)
    n.line("AV-CABLE", "BF-11", "AV-1", complex(0.375, 0.3), complex(2.28, 1.05))
    n.line("GN-OHL", "BF-11", "GN-1", complex(1.08, 1.4), complex(1.68, 5.2))
    return n


def generator_cases():
    ra = Relay("RA", "AV-CABLE", 0, 11, [("phase", "non", si(400, 0.2)), ("ground", "non", si(80, 0.2))], 0.06)
    for direction in ("non", "fwd"):
        rg = Relay("RG", "GN-OHL", 0, 11, [("phase", direction, si(250, 0.05)), ("ground", "non", si(40, 0.1))], 0.06)
        # Every fault RA must clear alone (Ash Vale has no source): the bus
        # AV-1 and the cable's close-in and mid-point positions.
        places = [("bus", "AV-1"), ("branch", "AV-CABLE", 0), ("branch", "AV-CABLE", 0.5), ("branch", "AV-CABLE", 1)]
        worst = None
        operations = 0
        for place in places:
            for case in (MAX, MIN):
                for kind in KINDS:
                    s = solve(generator_feeder(case), place, kind, case)
                    sa, sg = ra.seen(s, "BF-11"), rg.seen(s, "BF-11")
                    ta, tg = ra.time(sa), rg.time(sg)
                    if not math.isfinite(tg):
                        continue
                    operations += 1
                    # The same fault through a growing fault impedance scales
                    # every current by one factor, down to the minimum-case
                    # fault at that place or RA's pickup: the margin there
                    # too (dense samples).
                    lo = solve(generator_feeder(MIN), place, kind, MIN)
                    lowest = 400 / np.abs(sa["I"]).max()
                    if abs(sa["I"].sum()) > 0:
                        lowest = min(lowest, 80 / abs(sa["I"].sum()))
                    floor = max(lo.fault_a / s.fault_a, lowest)
                    for scale in np.concatenate(([1.0], np.geomspace(1.0, floor, 400))):
                        if scale < 1 and (case != MAX or kind == "LLG"):
                            break
                        ka = {**sa, "I": sa["I"] * scale}
                        kg = {**sg, "I": sg["I"] * scale}
                        t_a, t_g = ra.time(ka), rg.time(kg)
                        if not (math.isfinite(t_a) and math.isfinite(t_g)):
                            continue
                        m = t_g - t_a
                        if worst is None or m < worst[0] - 1e-12:
                            worst = (m, place, case, kind, scale, rg.governing(kg), t_g, ra.governing(ka), t_a, sg)
        key = f"gen.{direction}"
        put(f"{key}.operations", operations)
        if worst is None:
            continue
        m, place, case, kind, scale, ig, tg, ia, ta, sg = worst
        put(f"{key}.worst.margin", m)
        put(f"{key}.worst.scale", scale)
        put(f"{key}.worst.kind", KINDS.index(kind))
        put(f"{key}.worst.max", case == MAX)
        put(f"{key}.worst.placeBF", place == ("branch", "AV-CABLE", 0))
        put(f"{key}.worst.RG.A", ig)
        put(f"{key}.worst.RG.s", tg)
        put(f"{key}.worst.RA.A", ia)
        put(f"{key}.worst.RA.s", ta)
        put(f"{key}.worst.RG.dira", default_element("GN-OHL", 0, 11).phase_dirs(sg)[0][0])


# testdata/discrimination/parallel-transformers.toml


def twin_transformers(case):
    n = Network()
    n.add_bus("HX-33", 33, 0.0)
    n.add_bus("HX-11", 11, 30.0)  # Dyn11: the LV side leads by 30 degrees
    g = complex(0.15, 1.5) if case == MAX else complex(0.3, 3.0)
    n.shunt("HX-33", g, g, complex(0.3, 2.0))
    k = k_t(10, 15) if case == MAX else 1.0
    zt = k * polar_xr(0.10 * 11 ** 2 / 10, 15)
    for name in ("T1", "T2"):
        n.dyn(name, "HX-33", "HX-11", zt, zt, 12.7)
    return n


def twin_relays(directional):
    relays = []
    for t in ("T1", "T2"):
        relays.append(Relay(f"{t}-HV", t, 0, 33, [("phase", "non", si(250, 0.3)), ("ground", "non", si(60, 0.4))],
                            0.08, neutral_ct=t))
    for t in ("T1", "T2"):
        st = [("phase", "non", si(700, 0.2)), ("ground", "non", si(100, 0.2))]
        if directional:
            st += [("phase", "fwd", dt(300, 0.2)), ("ground", "fwd", dt(50, 0.2))]
        relays.append(Relay(f"{t}-LV", t, 1, 11, st, 0.06))
    return relays


def twin_cases():
    for variant, directional in (("non", False), ("dir", True)):
        relays = twin_relays(directional)
        records = {}
        slowest = None
        for end in (0, 1):  # T1's close-in faults at its 33 kV and 11 kV ends
            for case in (MAX, MIN):
                for kind in KINDS:
                    f = Fault(twin_transformers, ("branch", "T1", end), kind, case)
                    sides = [(("T1", 0), ["T1-HV"]), (("T1", 1), ["T1-LV", "T2-LV", "T2-HV"])]
                    iso, events, rec = clear_sequence(f, relays, sides)
                    tag = f"twin.{variant}.T1@{end}.{case}.{kind}"
                    if slowest is None or iso > slowest[0] * (1 + 1e-9):
                        slowest = (iso, end, case, kind, events)
                    if "T2-LV" in rec:
                        records[(f"T1, {['HX-33', 'HX-11'][end]} end", case, kind)] = rec["T2-LV"]
                    if end == 1 and case == MAX and kind == "LLL":
                        put(f"{tag}.clear", iso)
                        s = f.solve()
                        for r in relays:
                            sn = r.seen(s, bus_of(twin_transformers(MAX), r))
                            put(f"{tag}.{r.name}.A", r.governing(sn))
                            t = r.time(sn)
                            put(f"{tag}.{r.name}.s", t if math.isfinite(t) else -1)
                            if r.name in ("T1-LV", "T2-LV"):
                                put(f"{tag}.{r.name}.dira", r.phase_dirs(sn)[0][0])
        put_worst(f"twin.{variant}.T2-LV", records, relays)
        put_slowest(f"twin.{variant}.slowest", slowest, relays)


# testdata/discrimination/parallel-lines.toml


def parallel_lines(case):
    n = Network()
    n.add_bus("SC-S", 33)
    n.add_bus("SC-R", 33)
    g = complex(0.2, 2.0) if case == MAX else complex(0.4, 4.0)
    n.shunt("SC-S", g, g, complex(0.4, 3.0))
    for name in ("L1", "L2"):
        n.line(name, "SC-S", "SC-R", 12 * complex(0.17, 0.38), 12 * complex(0.45, 1.2))
    return n


def line_relays(directional):
    d = "fwd" if directional else "non"
    relays = [Relay(f"{l}-S", l, 0, 33, [("phase", "non", si(480, 0.3)), ("ground", "non", si(100, 0.3))], 0.06)
              for l in ("L1", "L2")]
    relays += [Relay(f"{l}-R", l, 1, 33, [("phase", d, si(150, 0.1)), ("ground", d, si(60, 0.1))], 0.06)
               for l in ("L1", "L2")]
    return relays


LINE_POSITIONS = [0, 0.1, 0.3, 0.5, 0.7, 0.9, 1]


def line_cases():
    for variant, directional in (("non", False), ("dir", True)):
        relays = line_relays(directional)
        # The healthy line's relays whose margins the tests judge: the
        # receiving end L2-R (it is the only one that can trip with L1-R),
        # and, directional, the sending end L2-S (non-directional, its
        # worst fault may lie at SC-R, which this script does not solve).
        judged = ["L2-R"] if variant == "non" else ["L2-R", "L2-S"]
        worst = {name: {} for name in judged}
        slowest = None
        for frac in LINE_POSITIONS:
            place = {0: "L1, SC-S end", 1: "L1, SC-R end"}.get(frac, f"L1 {frac * 100:.0f} %")
            for case in (MAX, MIN):
                for kind in KINDS:
                    f = Fault(parallel_lines, ("branch", "L1", frac), kind, case)
                    sides = [(("L1", 0), ["L1-S"]), (("L1", 1), ["L1-R", "L2-R", "L2-S"])]
                    iso, events, rec = clear_sequence(f, relays, sides)
                    if slowest is None or iso > slowest[0] * (1 + 1e-9):
                        slowest = (iso, frac, case, kind, events)
                    for name in judged:
                        if name in rec:
                            worst[name][(place, case, kind)] = rec[name]
                    # What the receiving ends see in the intact network.
                    s = f.solve()
                    tag = f"lines.{variant}.L1@{frac:g}.{case}.{kind}"
                    for r in relays[2:]:
                        sn = r.seen(s, "SC-R")
                        put(f"{tag}.{r.name}.A", np.abs(sn["I"]).max())
                        put(f"{tag}.{r.name}.3I0", abs(sn["I"].sum()))
                        t = r.time(sn)
                        put(f"{tag}.{r.name}.s", t if math.isfinite(t) else -1)
        for name, records in worst.items():
            put(f"lines.{variant}.{name}.operates", len(records))
            if records:
                put_worst(f"lines.{variant}.{name}", records, relays)
        put_slowest(f"lines.{variant}.slowest", slowest, relays)


# testdata/discrimination/ring.toml


def ring(case):
    n = Network()
    for b in ("RF-A", "RF-B", "RF-C"):
        n.add_bus(b, 33)
    g = complex(0.15, 1.5) if case == MAX else complex(0.3, 3.0)
    n.shunt("RF-A", g, g, complex(0.3, 2.0))
    z1, z0 = complex(0.17, 0.38), complex(0.45, 1.2)
    n.line("AB", "RF-A", "RF-B", 6 * z1, 6 * z0)
    n.line("BC", "RF-B", "RF-C", 8 * z1, 8 * z0)
    n.line("CA", "RF-C", "RF-A", 5 * z1, 5 * z0)
    return n


def ring_relays(pickup=250):
    """The ring's relays; pickup is that of the directional relays at RF-B
    and RF-C."""
    return [
        Relay("AB-A", "AB", 0, 33, [("phase", "non", si(400, 0.35))], 0.06),
        Relay("BC-B", "BC", 0, 33, [("phase", "fwd", si(pickup, 0.2))], 0.06),
        Relay("CA-C", "CA", 0, 33, [("phase", "fwd", si(pickup, 0.05))], 0.06),
        Relay("CA-A", "CA", 1, 33, [("phase", "non", si(400, 0.35))], 0.06),
        Relay("BC-C", "BC", 1, 33, [("phase", "fwd", si(pickup, 0.2))], 0.06),
        Relay("AB-B", "AB", 1, 33, [("phase", "fwd", si(pickup, 0.05))], 0.06),
    ]


RING_SIDES = {
    # Per end of the line: the chain back to the source (the relay at that
    # end, then the relays on the way round to RF-A).
    "AB": [(("AB", 0), ["AB-A"]), (("AB", 1), ["AB-B", "BC-C", "CA-A"])],
    "BC": [(("BC", 0), ["BC-B", "AB-A"]), (("BC", 1), ["BC-C", "CA-A"])],
    "CA": [(("CA", 0), ["CA-C", "BC-B", "AB-A"]), (("CA", 1), ["CA-A"])],
}


def put_worst(key, records, relays):
    """A relay's worst margin over the faults others must clear, and the
    figures of every fault that gives it (the checker names one of them)."""
    worst = min(r[0] for r in records.values())
    put(f"{key}.worst", worst)
    for (place, case, kind), (m, other, d_a, d_s, m_a, m_s) in records.items():
        if m > worst + 1e-6:
            continue
        k = f"{key}|{place}|{case}|{kind}"
        put(f"{k}.margin", m)
        put(f"{k}.other", [r.name for r in relays].index(other))
        put(f"{k}.A", d_a)
        put(f"{k}.s", d_s)
        put(f"{k}.otherA", m_a)
        put(f"{k}.otherS", m_s)


def put_slowest(key, slowest, relays):
    """The slowest-cleared fault of an element and its openings."""
    iso, frac, case, kind, events = slowest
    put(f"{key}.clear", iso)
    put(f"{key}.frac", frac)
    put(f"{key}.max", case == MAX)
    put(f"{key}.kind", KINDS.index(kind))
    put(f"{key}.events", len(events))
    for i, (name, at, now_a, first_a) in enumerate(events):
        put(f"{key}.{i}.relay", [r.name for r in relays].index(name))
        put(f"{key}.{i}.s", at)
        put(f"{key}.{i}.A", now_a)
        put(f"{key}.{i}.intactA", first_a)


def ring_cases():
    for pickup, name in ((250, "ring"), (400, "ring400")):
        relays = ring_relays(pickup)
        for line in ("AB", "BC", "CA"):
            ring_line(name, line, relays)
    ring_by_hand()


def ring_line(name, line, relays):
    """The slowest-cleared fault of one line of the ring: every position
    the study solves (close in at both ends and the line positions), both
    cases, every kind."""
    slowest = None
    for frac in (0, 0.25, 0.5, 0.75, 1):
        for case in (MAX, MIN):
            for kind in KINDS:
                f = Fault(ring, ("branch", line, frac), kind, case)
                iso, events, _ = clear_sequence(f, relays, RING_SIDES[line])
                if slowest is None or iso > slowest[0] * (1 + 1e-9):
                    slowest = (iso, frac, case, kind, events)
    put_slowest(f"{name}.{line}.slowest", slowest, relays)


def ring_by_hand():
    """One fault step by step: LLL in the maximum case a quarter of the way
    along BC from RF-B. BC-B trips first on the intact ring's current; by
    the time its breaker opens, BC-C has done that time's share of its own
    operating time t0, and it finishes the rest on the current it carries
    once BC-B is open."""
    relays = ring_relays()
    f = Fault(ring, ("branch", "BC", 0.25), "LLL", MAX)
    by = {r.name: r for r in relays}
    s0 = f.solve()
    b0 = by["BC-B"].seen(s0, "RF-B")
    c0 = by["BC-C"].seen(s0, "RF-C")
    put("ring.BC@0.25.BC-B.A0", abs(b0["I"]).max())
    put("ring.BC@0.25.BC-C.A0", abs(c0["I"]).max())
    tb, tc0 = by["BC-B"].time(b0), by["BC-C"].time(c0)
    put("ring.BC@0.25.BC-B.s0", tb)
    put("ring.BC@0.25.BC-C.s0", tc0)
    first_open = tb + 0.06
    s1 = f.solve((("BC", 0),))
    c1 = by["BC-C"].seen(s1, "RF-C")
    tc1 = by["BC-C"].time(c1)
    put("ring.BC@0.25.BC-C.A1", abs(c1["I"]).max())
    put("ring.BC@0.25.BC-C.s1", tc1)
    done = first_open / tc0
    second_trip = first_open + (1 - done) * tc1
    put("ring.BC@0.25.first.open", first_open)
    put("ring.BC@0.25.second.open", second_trip + 0.06)
    put("ring.BC@0.25.BC-C.dira0", by["BC-C"].phase_dirs(c0)[0][0])
    put("ring.BC@0.25.BC-C.dira1", by["BC-C"].phase_dirs(c1)[0][0])


def main():
    direction_cases()
    generator_cases()
    twin_cases()
    line_cases()
    ring_cases()
    if sys.argv[1:] == ["--go"]:
        print("// Code generated by testdata/discrimination/handcheck.py --go; DO NOT EDIT.")
        print()
        print("package coord_test")
        print()
        print("// handFigures are the figures of testdata/discrimination/handcheck.py,")
        print("// embedded so that the tests run without Python; TestHandcheckScript")
        print("// runs the script and compares.")
        print("var handFigures = map[string]float64{")
        for k in sorted(OUT):
            print(f"\t{json.dumps(k)}: {OUT[k]!r},")
        print("}")
        return
    json.dump(OUT, sys.stdout, indent=1, sort_keys=True)
    print()


if __name__ == "__main__":
    main()
