// Package faults computes short-circuit currents in a three-phase network
// with the method of symmetrical components: it builds the positive,
// negative and zero sequence networks of the elements in a Network, factors
// their admittance matrices once per case, and answers, for a fault of a
// given kind at a given place, the phase and residual currents at any
// measuring point (one end of a branch).
//
// # Method
//
// The calculation follows the equivalent voltage source method of
// IEC 60909-0: loads and line charging are neglected, every source is
// replaced by its internal impedance, and the only driving voltage is
// c·Un/√3 at the fault location, with the voltage factor c of that location's
// voltage level and of the case (see Case). Currents are initial symmetrical
// (sub-transient) r.m.s. values. For a three-phase fault at a bus,
// Engine.Duty adds what switchgear must make and break there: the peak
// current i_p (κ by method C, at an equivalent frequency), the symmetrical
// breaking current I_b (the decay of generators' and motors' shares at the
// Settings' minimum time delay) and the steady-state current I_k.
//
// Besides lines, two-winding transformers, grid equivalents, generators and
// earthing transformers, a Network holds three-winding transformers (a star
// of three branches around an internal bus, Bus.Internal, which is no
// place for a fault), asynchronous motors (maximum case only) and power
// station units (a Generator whose Unit names its unit transformer; both
// carry the unit's K_S or K_SO).
//
// The sequence fault currents follow the textbook connections of the
// sequence networks at the fault point (Grainger & Stevenson, Power System
// Analysis, ch. 12): for Thevenin impedances Z1, Z2, Z0 and fault impedance Zf,
//
//	LLL:  I1 = E/(Z1+Zf)
//	LL:   I1 = −I2 = E/(Z1+Z2+Zf)                 (phases b and c, no earth)
//	LG:   I1 = I2 = I0 = E/(Z1+Z2+Z0+3Zf)         (phase a to earth)
//	LLG:  I1 = E/(Z1 + Z2‖(Z0+3Zf)), I2 = −I1(Z0+3Zf)/(Z2+Z0+3Zf),
//	      I0 = −I1·Z2/(Z2+Z0+3Zf)                 (phases b and c to earth)
//
// The Thevenin impedances and the transfer impedances to every other bus are
// entries of the bus impedance matrices, found from a sparse LDLᵀ
// factorization of each admittance matrix (package faults/sparse) without
// ever forming a dense matrix. A fault at fraction p along a line i–j of
// series impedance z uses the bus-impedance building rules: Z_xf =
// (1−p)·Z_xi + p·Z_xj and Z_ff = (1−p)²Z_ii + p²Z_jj + 2p(1−p)Z_ij + p(1−p)z.
//
// # Per unit
//
// Inside the engine every quantity is per unit on the network's base MVA and
// on a base kV equal to the nominal kV of each bus. Inputs and results are in
// SI units (ohms, kV, MVA, amperes); names carry the unit.
//
// # Phase shift and angles
//
// A transformer with IEC clock number h shifts positive-sequence quantities
// by h·30° with the low-voltage side lagging (Dyn11: the LV side leads the
// HV side by 30°), negative-sequence quantities by the opposite angle, and
// zero-sequence quantities not at all. The engine solves each connected
// network in a frame where every bus has been rotated back by the phase
// shift of its zone, so the admittance matrices stay symmetric, and rotates
// the sequence currents of each measuring point by the shift between its
// zone and the fault's zone. Transformers that would close a loop with
// inconsistent shifts are an error.
//
// Angles are in degrees, counter-clockwise positive (a positive angle
// leads). The reference is the pre-fault phase-a-to-neutral voltage at the
// fault location, so a bolted three-phase fault behind a purely inductive
// network gives Ia at −90°. Phase a is the faulted phase of an LG fault; b
// and c are the faulted phases of LL and LLG faults; all three phase labels
// are those of the fault location. At a measuring point on the other side of
// a transformer the phases keep their labels (a, b, c of that bus) and the
// sequence currents carry the transformer's phase shift.
//
// # Directions
//
// The current at a measuring point is positive when it flows from the
// point's bus into its branch. The residual current is Ia+Ib+Ic = 3I0,
// with the same sign convention. Fault current flows from the network into
// the fault.
//
// # Zero-sequence paths
//
// Each winding connection gives the zero-sequence path of the textbook
// tables: YNyn is a series path (with 3Zn of each earthed neutral), YNd and
// Dyn are a shunt path to earth on the earthed-star side only, every other
// connection is open. A grounding (zig-zag or star–delta earthing)
// transformer is a shunt Z0+3Zn. A part of the network with no zero-sequence
// path to earth carries no earth-fault current: faults to earth there give
// only the current that the phase-to-phase part of the fault draws. Line
// capacitance is not modelled, so the capacitive earth-fault current of an
// unearthed system is reported as zero.
//
// Example:
//
//	eng, err := faults.New(net, faults.Settings{})
//	if err != nil { ... }
//	sol, err := eng.Solve(eng.CaseFault(faults.AtBus(k), faults.LG, faults.Min))
//	if err != nil { ... }
//	at := sol.At(faults.Point{Branch: b, End: faults.From})
//	fmt.Printf("%.0f A\n", at.PhaseMaxA())
package faults
