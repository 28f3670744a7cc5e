package coord

import "tripgrade/faults"

// solver remembers solved faults: the checks ask for the same faults many
// times (every pair of a zone looks at the faults of that zone).
type solver struct {
	eng  *faults.Engine
	memo map[faults.Fault]faults.Solution
}

func newSolver(eng *faults.Engine) *solver {
	return &solver{eng: eng, memo: map[faults.Fault]faults.Solution{}}
}

// solve returns the solution of the case's standard fault of kind k at p.
func (s *solver) solve(p faults.Place, k faults.Kind, cs faults.Case) (faults.Solution, error) {
	f := s.eng.CaseFault(p, k, cs)
	if sol, ok := s.memo[f]; ok {
		return sol, nil
	}
	sol, err := s.eng.Solve(f)
	if err != nil {
		return sol, err
	}
	s.memo[f] = sol
	return sol, nil
}
