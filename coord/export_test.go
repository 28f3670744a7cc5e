package coord

// RegionShare returns how many buses of scenario study st the check of
// outage sc of study s works out (the rest taken from the study as
// drawn), and how many buses st has; in is len(st.Network.Buses) where
// nothing is taken over.
func RegionShare(s *Study, sc Scenario, st *Study) (in, total int) {
	g := changedRegion(s.Network, st.Network, sc.Out, newReusable())
	total = len(st.Network.Buses)
	if g == nil {
		return total, total
	}
	for _, ok := range g.in {
		if ok {
			in++
		}
	}
	return in, total
}
