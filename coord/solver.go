package coord

import (
	"sync"

	"tripgrade/faults"
)

// solver remembers solved faults: the checks ask for the same faults many
// times (every pair of a zone looks at the faults of that zone). It is
// safe for concurrent use.
type solver struct {
	eng  *faults.Engine
	mu   sync.RWMutex
	memo map[faults.Fault]faults.Solution
}

func newSolver(eng *faults.Engine) *solver {
	return &solver{eng: eng, memo: map[faults.Fault]faults.Solution{}}
}

// solve returns the solution of the case's standard fault of kind k at p.
func (s *solver) solve(p faults.Place, k faults.Kind, cs faults.Case) (faults.Solution, error) {
	f := s.eng.CaseFault(p, k, cs)
	s.mu.RLock()
	sol, ok := s.memo[f]
	s.mu.RUnlock()
	if ok {
		return sol, nil
	}
	sol, err := s.eng.Solve(f)
	if err != nil {
		return sol, err
	}
	s.mu.Lock()
	s.memo[f] = sol
	s.mu.Unlock()
	return sol, nil
}
