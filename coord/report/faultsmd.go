package report

import (
	"fmt"
	"io"

	"tripgrade/faults"
)

// WriteMarkdown writes the fault tables as Markdown: the cases, the
// currents each device sees over its own zone, and the bus fault levels.
// User text is escaped as in the findings tables.
func (t *FaultTables) WriteMarkdown(w io.Writer) error {
	ew := &errWriter{w: w}
	fmt.Fprintf(ew, "# Fault study: %s\n\n> %s\n\n", md(t.Study), Caution)
	for _, c := range t.Cases {
		fmt.Fprintf(ew, "- %s\n", md(c))
	}
	fmt.Fprintf(ew, "\n## Currents each device sees for faults in its own zone\n\nPrimary amperes; ground = residual current 3I0, or the neutral current of a relay on a neutral CT.\n\n")
	fmt.Fprintln(ew, "| device | branch | at | kV | phase max | fault | phase min | fault | ground max | fault | ground min | fault |")
	fmt.Fprintln(ew, "| --- | --- | --- | ---: | ---: | --- | ---: | --- | ---: | --- | ---: | --- |")
	for _, p := range t.Points {
		pmax, pmaxF := p.PhaseMax.text("no fault current")
		pmin, pminF := p.PhaseMin.text("no fault current")
		gmax, gmaxF := p.GroundMax.text("no earth-fault current")
		gmin, gminF := p.GroundMin.text("no earth-fault current")
		fmt.Fprintf(ew, "| %s | %s | %s | %g | %s | %s | %s | %s | %s | %s | %s | %s |\n",
			md(p.Device), md(p.Branch), md(p.At), p.KV, pmax, md(pmaxF), pmin, md(pminF), gmax, md(gmaxF), gmin, md(gminF))
	}
	fmt.Fprintf(ew, "\n## Fault currents at each bus\n\nAmperes into the fault; LLG: earth current 3I0.\n\n")
	fmt.Fprintln(ew, "| bus | kV | LLL max | LL max | LG max | LLG max | LLL min | LL min | LG min | LLG min |")
	fmt.Fprintln(ew, "| --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |")
	for _, b := range t.Buses {
		fmt.Fprintf(ew, "| %s | %g |", md(b.Bus), b.KV)
		for _, cs := range faults.Cases {
			for _, k := range faults.Kinds {
				fmt.Fprintf(ew, " %s |", amps(busFigure(b.Faults[cs][k], k)))
			}
		}
		fmt.Fprintln(ew)
	}
	return ew.err
}
