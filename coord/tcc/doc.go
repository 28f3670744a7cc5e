// Package tcc draws time–current coordination charts: log–log plots of
// every protective device's operating time against current, one chart per
// coordination path and one per failing backup pair, with the fault
// levels, damage curves, inrush and load the curves are judged against,
// and each pair's grading margin at its worst fault.
//
// The package draws and computes no margin of its own: the worst point of
// every pair, its two currents and times and the verdict come from the
// pair's grading coord.Finding; fault levels from coord.FaultLevels; load
// and inrush from coord.LoadThrough and coord.InrushA; curves from
// coord.Timer and the study's equipment data.
//
// # Conventions
//
//   - A coordination path runs from a device that backs up nobody (it is
//     never the upstream device of a pair) through "is backed up by" links
//     towards a source. A device with several upstream devices (parallel
//     incomers) lies on one path through each. Paths wholly inside a
//     longer one are dropped; at most MaxPaths are drawn.
//   - Currents are referred to ONE voltage, named on the axis: that of the
//     bus of the path's most downstream device (for a pair's chart, of the
//     downstream device). A device on a bus of another nominal voltage has
//     its currents multiplied by the ratio of the two buses' nominal
//     voltages (kV of its bus ÷ kV of the reference bus), so a 33 kV relay
//     is drawn at 3× its current on an 11 kV axis. The ratio is of the
//     buses' nominal voltages, not of a transformer's winding voltages or
//     tap; labels on the plot are in axis amperes, and the key beside it
//     gives every device's fault levels in its own amperes.
//   - Times are in seconds from TimeMinS to TimeMaxS (0.01 s to 1000 s).
//     Curves are operating times without the breaker, as the grading check
//     uses them; a fuse shows minimum melting and total clearing. A relay's
//     time below the axis (an instantaneous stage modelled as 0 s) is drawn
//     on the axis floor; a fuse or damage curve below it leaves the plot.
//   - Styles: a relay's phase stages combined are a solid line, its ground
//     (residual, 51N/50N) stages a dashed one; a fuse's melting curve is
//     thin and its clearing curve thick, the spread between them lightly
//     shaded, as is a relay's declared tolerance band (Timer Early to
//     Late). Fault levels are thin vertical lines, solid for the maximum
//     and dotted for the minimum, with a ring where the device's own curve
//     crosses them. Damage curves are grey with ticks on the damage side.
//     The maximum load is a dash-dot line, an inrush point a cross.
//   - A pair's margin is a bracket at the downstream device's current
//     between the two devices' times at the worst fault, with the required
//     interval dashed beside it and a dotted link to the upstream device's
//     own operating point when it sees another current. A failing margin
//     is vermillion, thicker, ringed and written "FAIL 0.21 s < 0.30 s";
//     a passing one is dark grey, "0.45 s ≥ 0.30 s".
//   - Colours are the Okabe & Ito colour-blind-safe set, vermillion kept
//     for failures. Every device has one colour in all the charts of a
//     study, chosen so that devices drawn together differ where the six
//     colours allow; its name is written on its curve, so no reading
//     depends on colour alone.
//   - Chart names are file stems, safe on every file system:
//     "path-D--M--U" for a path (device names sanitised by Sanitise,
//     downstream first, joined by "--") and "pair-D-under-U" for a failing
//     pair; Namer makes them unique within a study.
//   - The renderer writes to an io.Writer (Chart.WriterTo, as gonum/plot's
//     Plot.WriterTo); it never opens files. The default size is 1600 × 1200
//     pixels at 160 dpi; Locate maps a chart point to its pixel by the
//     plot's own transform.
//
// # Example
//
//	a, err := tcc.NewAtlas(tcc.Input{Study: s, Topology: topo, Result: res, Levels: levels})
//	if err != nil { ... }
//	for _, c := range a.Charts() {
//		var buf bytes.Buffer
//		if err := c.Render(&buf, tcc.PNG, tcc.Settings{}); err != nil { ... }
//		// write buf to c.Name + ".png"
//	}
package tcc
