// Package tcc draws time–current coordination charts: log–log plots of
// protective devices' operating times against current, for the phase
// faults and, apart, for the earth faults of every coordination path, and
// for every failing backup pair, with the fault levels, damage curves,
// inrush and load the curves are judged against, and each pair's grading
// margin at its worst fault.
//
// The package draws and computes no margin of its own: the worst point of
// every pair, its two currents and times, which current (phase or
// residual) set each time, and the verdict come from the pair's grading
// coord.Finding; fault levels from coord.FaultLevels; load and inrush from
// coord.LoadThrough and coord.InrushA; curves from coord.Timer and the
// study's equipment data; referral from coord.Topology.
//
// # Conventions
//
//   - A coordination path runs from a device that backs up nobody (it is
//     never the upstream device of a pair) through "is backed up by" links
//     towards a source. A device with several upstream devices (parallel
//     incomers) lies on one path through each. Paths wholly inside a
//     longer one are dropped; at most MaxPaths are drawn.
//   - Phase and earth apart. A path's phase-fault charts hold its fuses and
//     the phase stages of its relays, against phase fault levels. Its
//     earth-fault charts hold the ground (residual, 51N/50N) stages of the
//     relays that residual current reaches from some fault of their zone,
//     against residual (3I0) fault levels, one chart for each run of them
//     that zero-sequence current can cross: a transformer with a delta
//     winding (or an unearthed star) between two of them starts a new
//     chart. A pair's margin is drawn on the chart of the current that set
//     the downstream device's time at the worst fault; the key of the
//     other chart says where.
//   - Axes from what matters. The current axis holds, in whole decades
//     with some room, every drawn device's lowest pickup of the chart's
//     kind and the fault levels it sees over its zone, and each margin's
//     two currents. Loads, inrush points and levels that fall outside are
//     listed in the key, not allowed to stretch the axis. A path whose
//     axis would span more than four decades is split at a transformer
//     between two of its devices into a part below and a part above, each
//     referred to its own voltage; the first device above the transformer
//     ends the lower part too (so the pair across it is drawn with both
//     curves), and its own fault levels, which belong to the upper part,
//     do not set the lower part's axis. Of the transformers it could split
//     at it takes the one leaving the narrower widest part.
//   - Referral. Every current on a chart is referred to the bus of its
//     most downstream device by the transformers' rated winding ratios
//     (coord.Topology.ReferA; RefKV is coord.Topology.RatioKV of that bus),
//     the ratio the fault engine carries currents by, so an 11/0.433 kV
//     transformer's HV fuse is drawn at 11/0.433 = 25.4 × its current on
//     an axis "A at 0.433 kV, referred by winding ratios". Labels on the
//     plot are in axis amperes; the key gives each device's fault levels
//     in its own.
//   - Times are in seconds from TimeMinS to TimeMaxS (0.01 s to 1000 s).
//     Curves are operating times without the breaker, as the grading check
//     uses them; a fuse shows minimum melting (thin) and total clearing
//     (thick). A relay's time below the axis (an instantaneous stage
//     modelled as 0 s) is drawn on the axis floor; a fuse or damage curve
//     below it leaves the plot.
//   - Looks. Every device has a colour and a line pattern (Style): the
//     Okabe & Ito colour-blind-safe colours, vermillion kept for failures,
//     then each again dashed, dash-dot and so on. No two devices with a
//     curve on one chart share both; a device keeps its look on every
//     chart where the palette allows; its name is written on its curve, so
//     no reading depends on colour alone. The spread of a fuse's two
//     curves and a relay's declared tolerance band are lightly shaded.
//     Fault levels are thin vertical lines in the device's colour, solid
//     for the maximum and dotted for the minimum, with a ring where the
//     device's own curve crosses them. Damage curves are grey with ticks on
//     the damage side. The maximum load is a dash-dot line, an inrush
//     point a cross.
//   - Margins. A pair's margin is a bracket at the downstream device's
//     current between the two devices' times at the worst fault, with the
//     required interval dashed beside it. A failing margin is vermillion,
//     thicker, ringed when short and written "FAIL 0.21 s < 0.30 s"; a
//     passing one is dark grey, "0.45 s ≥ 0.30 s".
//   - The fault kind that decides a margin. Where the upstream device sees
//     another current than the downstream one at the worst fault (2/√3 of
//     the referred current for a phase-to-phase fault behind a delta–star
//     transformer, 1/√3 for an earth fault, a share through parallel
//     incomers), or its time was set by the other kind of current, its
//     curve is drawn again, thin, against the downstream device's current:
//     t_U(k·I) with k the ratio of the finding's two currents. It passes
//     through the bracket's top and is labelled "T1-HV at LL faults:
//     I × 2/√3". A dotted link joins the bracket's top to the upstream
//     device's own operating point.
//   - Labels never cover each other, a bracket, a ring or a mark, nor
//     cross the plot's edge; they keep off the curves where there is room.
//     A label with no free place is listed in the key instead.
//   - Text is drawn as the outlines of Liberation Sans glyphs (which
//     gonum/plot embeds) in PNG and SVG alike, so an SVG shows the same
//     picture on a machine without the font; an SVG carries the chart's
//     name in its <title>. Every chart carries the caution of the reports.
//   - Chart names are file stems, safe on every file system:
//     "path-D--M--U" for a phase-fault chart (device names sanitised by
//     Sanitise, downstream first, joined by "--"), the same with "-earth"
//     for an earth-fault chart, and "pair-D-under-U" for a failing pair;
//     Namer makes them unique within a study. A chart two paths share is
//     drawn once.
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
