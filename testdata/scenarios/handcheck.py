#!/usr/bin/env python3
"""Hand figures for tripgrade's scenario tests (coord/scenario_test.go).

Usage: handcheck.py         print every figure as JSON {key: number}
       handcheck.py --go    print the same figures as the Go table that
                            coord/scenariofigures_test.go embeds:
           python3 testdata/scenarios/handcheck.py --go | gofmt > coord/scenariofigures_test.go

Four small invented studies beside this file, each with one scenario, are
worked here in closed form, from the studies' data written out below (not
read from the files, and nothing from tripgrade's engine): the fault at the
feeder's sending end in the maximum case, the currents the relays see and
their operating times, as drawn and in the scenario. The Go test embeds the
figures as constants and, where Python with numpy is available (always in
CI), runs this script and asks that its output agree with them.

Sources, named beside each use:
* IEC 60909-0:2016, the equivalent voltage source c*Un/sqrt(3) at the
  fault with c_max = 1.10 above 1 kV (Table 1); the network feeder
  Z_Q = c*U_nQ^2/S"kQ with X_Q = Z_Q/sqrt(1 + (R/X)^2) (clause 6.2,
  network feeders); the two-winding transformer Z_T = u_kr*U_rT^2/S_rT with
  X/R given (clause 6.3.1) and its correction K_T = 0.95*c_max/(1 + 0.6*x_T)
  (clause 6.3.3, network transformers); the synchronous generator
  Z_GK = K_G*(R_G + jX"d), K_G = (U_n/U_rG)*c_max/(1 + x"d*sin(phi_rG))
  (clause 6.6.1); the initial currents I"k3 = c*Un/(sqrt(3)*|Z1|) and
  I"k2 = c*Un/|Z1 + Z2| (clause 7, three-phase and line-to-line short
  circuits). Clause numbers from memory of the 2016 edition.
* Parallel paths: the current divider and, for identical units, each
  carrying half the current by symmetry (circuit theory).
* Symmetrical components and the delta-star phase shift (Dyn11: the LV
  side leads the HV side by 30 degrees in the positive sequence and lags by
  30 degrees in the negative sequence): Grainger & Stevenson, Power System
  Analysis (1994), ch. 11. The resulting HV phase current for an LV
  line-to-line fault, 2/sqrt(3) of the ratio-referred LV current in one
  phase: IEEE Std 242 ch. 15, IEEE C37.91.
* IEC 60255-151:2009 Table 1, standard inverse:
  t = TMS*0.14/((I/Is)^0.02 - 1).
"""

import cmath
import json
import math
import sys

import numpy as np

C_MAX = 1.10  # IEC 60909-0 Table 1, above 1 kV
A = cmath.exp(2j * math.pi / 3)
SEQ_TO_PHASE = np.array([[1, 1, 1], [1, A * A, A], [1, A, A * A]])

OUT = {}


def put(key, value):
    if not math.isfinite(value):
        raise ValueError(f"{key}: non-finite {value}")
    OUT[key] = float(value)


def feeder(kv_n, s_mva, x_r, kv_ref):
    """IEC 60909-0 network feeder of S"kQ at kv_n, referred to kv_ref by
    the square of the rated ratio (ohms)."""
    z = C_MAX * kv_n**2 / s_mva
    x = z / math.sqrt(1 + 1 / x_r**2)
    return complex(x / x_r, x) * (kv_ref / kv_n) ** 2


def transformer(mva, kv_lv, z_pct, x_r):
    """K_T-corrected impedance of a two-winding network transformer in
    ohms at its LV rated voltage (IEC 60909-0 clauses 6.3.1, 6.3.3)."""
    z = z_pct / 100 * kv_lv**2 / mva
    x = z / math.sqrt(1 + 1 / x_r**2)
    x_t = z_pct / 100 * (x / z)  # relative reactance
    k_t = 0.95 * C_MAX / (1 + 0.6 * x_t)
    return k_t * complex(x / x_r, x)


def generator(mva, kv, xd_pct, r_pct, pf, kv_n):
    """K_G-corrected subtransient impedance in ohms (IEC 60909-0 clause
    6.6.1)."""
    zb = kv**2 / mva
    sin_phi = math.sqrt(1 - pf**2)
    k_g = (kv_n / kv) * C_MAX / (1 + xd_pct / 100 * sin_phi)
    return k_g * complex(r_pct / 100, xd_pct / 100) * zb


def par(a, b):
    return a * b / (a + b)


def si(i, pickup, tms):
    """IEC 60255-151 standard inverse operating time."""
    return tms * 0.14 / ((i / pickup) ** 0.02 - 1)


def e(kv):
    """The equivalent voltage source c*Un/sqrt(3), volts."""
    return C_MAX * kv * 1000 / math.sqrt(3)


def ll_phases(i1):
    """Phase currents of a b-c fault's sequence currents (I0 = 0,
    I2 = -I1): Grainger & Stevenson ch. 11."""
    return SEQ_TO_PHASE @ np.array([0, i1, -i1])


def hv_of_dyn11(i1_lv, ratio):
    """HV phase currents of LV sequence currents i1, -i1 through a Dyn11
    unit (the HV side lags in the positive sequence, leads in the
    negative), referred by the rated ratio kv_lv/kv_hv."""
    shift = cmath.exp(-1j * math.pi / 6)
    i1 = i1_lv * shift * ratio
    i2 = -i1_lv * shift.conjugate() * ratio
    return SEQ_TO_PHASE @ np.array([0, i1, i2])


def biggest(phases):
    return max(abs(p) for p in phases)


def parallel_units():
    """Harrow Fen (hand-parallel.toml): a line-to-line fault at HF-11, the
    sending end of F1-CABLE, in the maximum case; F1 sees the fault current,
    TA-HV the share of TA referred to 33 kV."""
    zq = feeder(33, 500, 10, 11)
    zt = transformer(10, 11, 10, 15)
    for name, z1, share in (("drawn", zq + zt / 2, 0.5), ("out", zq + zt, 1.0)):
        i1 = e(11) / (2 * z1)  # LL: I1 = E/(Z1 + Z2), Z2 = Z1
        i_f1 = biggest(ll_phases(i1))
        i_ta = biggest(hv_of_dyn11(i1 * share, 11 / 33))
        t_f1, t_ta = si(i_f1, 300, 0.1), si(i_ta, 200, 0.15)
        put(f"parallel.{name}.F1_A", i_f1)
        put(f"parallel.{name}.TA-HV_A", i_ta)
        put(f"parallel.{name}.F1_s", t_f1)
        put(f"parallel.{name}.TA-HV_s", t_ta)
        put(f"parallel.{name}.margin_s", t_ta - t_f1)
        put(f"parallel.{name}.share", i_ta / i_f1)


def bus_section():
    """Marlow Strand (hand-section.toml): a line-to-line fault at the
    sending end of F1-CABLE (section A), maximum case; TA (10 MVA) and TB
    (15 MVA) share it by the current divider while the section is closed."""
    zq = feeder(33, 600, 12, 11)
    za = transformer(10, 11, 10, 15)
    zb = transformer(15, 11, 12, 20)
    cases = (
        ("drawn", zq + par(za, zb), zb / (za + zb), za / (za + zb)),
        ("open", zq + za, 1.0, 0.0),
    )
    for name, z1, share_a, share_b in cases:
        i1 = e(11) / (2 * z1)
        i_f1 = biggest(ll_phases(i1))
        i_ta = biggest(hv_of_dyn11(i1 * share_a, 11 / 33))
        t_f1, t_ta = si(i_f1, 300, 0.1), si(i_ta, 200, 0.15)
        put(f"section.{name}.F1_A", i_f1)
        put(f"section.{name}.TA-HV_A", i_ta)
        put(f"section.{name}.F1_s", t_f1)
        put(f"section.{name}.TA-HV_s", t_ta)
        put(f"section.{name}.margin_TA-HV_s", t_ta - t_f1)
        if share_b != 0:
            i_tb = biggest(hv_of_dyn11(i1 * share_b, 11 / 33))
            t_tb = si(i_tb, 300, 0.15)
            put(f"section.{name}.TB-HV_A", i_tb)
            put(f"section.{name}.TB-HV_s", t_tb)
            put(f"section.{name}.margin_TB-HV_s", t_tb - t_f1)


def generator_off():
    """Coldharbour (hand-generator.toml): a three-phase fault at CH-2, the
    sending end of L2, maximum case. The grid (through L1) and the
    generator are two paths from the fault to the source voltage: each
    feeds E/Z_path, so R1's current does not depend on the generator."""
    z_grid = feeder(11, 200, 8, 11) + complex(1.35, 1.75)
    z_gen = generator(4, 11, 15, 1.05, 0.8, 11)
    for name, i_r2 in (("drawn", abs(e(11) / par(z_grid, z_gen))), ("off", abs(e(11) / z_grid))):
        i_r1 = abs(e(11) / z_grid)
        t_r1, t_r2 = si(i_r1, 300, 0.2), si(i_r2, 150, 0.1)
        put(f"generator.{name}.R1_A", i_r1)
        put(f"generator.{name}.R2_A", i_r2)
        put(f"generator.{name}.R1_s", t_r1)
        put(f"generator.{name}.R2_s", t_r2)
        put(f"generator.{name}.margin_s", t_r1 - t_r2)


def tie_closed():
    """Brackley Vale (hand-tie.toml): a three-phase fault at BV-N, the
    sending end of L3, maximum case. With the tie closed, L1 and L2 are
    two paths from the board to the fault, sharing its current by the
    current divider."""
    zq = feeder(11, 250, 10, 11)
    z1, z2 = complex(0.5, 0.4), complex(0.75, 0.6)
    i = abs(e(11) / (zq + z1))
    put("tie.drawn.R3_A", i)
    put("tie.drawn.R1_A", i)
    t3, t1 = si(i, 150, 0.1), si(i, 300, 0.2)
    put("tie.drawn.R3_s", t3)
    put("tie.drawn.R1_s", t1)
    put("tie.drawn.margin_R1_s", t1 - t3)
    i_f = e(11) / (zq + par(z1, z2))
    i3, i1, i2 = abs(i_f), abs(i_f * z2 / (z1 + z2)), abs(i_f * z1 / (z1 + z2))
    t3, t1, t2 = si(i3, 150, 0.1), si(i1, 300, 0.2), si(i2, 300, 0.2)
    put("tie.closed.R3_A", i3)
    put("tie.closed.R1_A", i1)
    put("tie.closed.R2_A", i2)
    put("tie.closed.R3_s", t3)
    put("tie.closed.R1_s", t1)
    put("tie.closed.R2_s", t2)
    put("tie.closed.margin_R1_s", t1 - t3)
    put("tie.closed.margin_R2_s", t2 - t3)


def main():
    parallel_units()
    bus_section()
    generator_off()
    tie_closed()
    if sys.argv[1:] == ["--go"]:
        print("// Code generated by testdata/scenarios/handcheck.py --go; DO NOT EDIT.\n")
        print("package coord_test\n")
        print("// scenarioFigures are handcheck.py's figures (see scenario_test.go).")
        print("var scenarioFigures = map[string]float64{")
        for k in sorted(OUT):
            print(f"\t{json.dumps(k)}: {OUT[k]!r},")
        print("}")
        return
    json.dump(OUT, sys.stdout, indent=1, sort_keys=True)
    print()


if __name__ == "__main__":
    main()
