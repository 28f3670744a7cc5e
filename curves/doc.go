// Package curves answers the question a coordination study asks many
// thousands of times: how long does this device take at this current? It
// models relay stages (IEC 60255-151 and IEEE C37.112 inverse-time,
// definite-time, instantaneous), tabulated curves (fuses, reclosers, any
// published graph), timing tolerance bands, and the withstand curves of
// the equipment a protection engineer plots beside them (IEEE C57.109
// transformer through-fault, cable adiabatic I²t). It knows nothing about
// networks or files.
//
// # Conventions
//
//   - Currents are RMS magnitudes in primary amperes, on whatever side of a
//     transformer the caller measures them; times are in seconds. Names
//     carry the unit: pickupA, timeS.
//   - Every curve is a Characteristic: Time(currentA) returns a time and a
//     Status. Operates means the time is finite and meaningful. NoTrip
//     ("does not operate") means the device will not operate at that
//     current: it is at or below the pickup. Undefined ("not defined")
//     means the curve says nothing there: outside a table's data, beyond a
//     validity limit such as the 5 s of the cable equation, or for a NaN
//     or negative current. A check that meets Undefined could not be
//     made; it is never a pass.
//   - With NoTrip the time returned is +Inf and with Undefined it is NaN,
//     so a caller who ignores the status cannot mistake either for a fast
//     operation. Look at the status all the same.
//   - Ranges: a relay stage operates only strictly above its pickup
//     (current > pickup; at pickup it does not operate). A table is defined
//     on the closed range from its first to its last point and passes
//     exactly through every point. Damage curves state their range on
//     their type.
//   - Time never increases with current. Every type here guarantees it (a
//     Func must too), and CurrentFor relies on it.
//   - For damage curves Time is the time the equipment withstands the
//     current; a protective device must clear faster.
//   - Inverse questions: CurrentFor returns the lowest current at which a
//     characteristic operates within a given time, in closed form where
//     one exists and by bisection in log current otherwise.
//   - Constructors (NewInverseTime, NewTable, NewStage, ...) validate and
//     report every bad value as an error that says what the value must be;
//     nothing panics on user data (Banded panics only when handed an
//     Accuracy its caller did not validate, a programmer error).
//     Evaluating does not re-validate, so use the constructors (or
//     Validate) before Time.
//   - The zero value of an optional setting means "off": MaxMultiple,
//     MinTimeS, a table's pickup, an I2tLimit's MaxTimeS, Accuracy.
//
// # Example
//
//	shape, err := curves.ParseShape("iec-si")
//	if err != nil { ... }
//	law, _ := shape.Law()
//	stage, err := curves.NewInverseTime(law, 400, 0.1) // pickup 400 A, TMS 0.1
//	if err != nil { ... }
//	relay := curves.Fastest{stage, curves.Instantaneous{PickupA: 4000}}
//	t, st := relay.Time(4000) // 0.2971 s, Operates: 10× pickup, and the 50 stage needs more than 4000 A
//	_, st = relay.Time(5000)  // 0 s: the instantaneous stage is the fastest
//	_, st = relay.Time(300)   // NoTrip: below every pickup
//
// # Speed
//
// Time allocates nothing. One InverseTime evaluation costs a logarithm and
// an exponential; a Table lookup a binary search and a power.
package curves
