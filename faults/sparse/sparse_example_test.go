package sparse_test

import (
	"errors"
	"fmt"

	"tripgrade/faults/sparse"
)

// radial builds the admittance matrix (per unit) of a grid source of j0.1
// at bus 0 feeding two lines of j0.2 each, 0–1 and 1–2. Its impedance
// matrix is known by inspection: Zₖₖ = j0.1, j0.3, j0.5 and Zᵢₖ = Z of the
// shared part of the paths to the source.
func radial() *sparse.Builder {
	b := sparse.NewBuilder(3)
	b.Add(0, 0, 1/0.1i) // the source's admittance to the reference
	line := func(i, j int, z complex128) {
		y := 1 / z
		b.Add(i, j, -y)
		b.Add(i, i, y)
		b.Add(j, j, y)
	}
	line(0, 1, 0.2i)
	line(1, 2, 0.2i)
	return b
}

func ExampleBuilder_Factor() {
	f, err := radial().Factor()
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println("buses:", f.Size(), "nonzeros in L:", f.NonZeros())
	fmt.Printf("Z22 = j%.4f pu\n", imag(f.Entry(2, 2)))
	// Output:
	// buses: 3 nonzeros in L: 2
	// Z22 = j0.5000 pu
}

func ExampleFactor_Entry() {
	f, _ := radial().Factor()
	// The transfer impedance between buses 2 and 1 is the impedance their
	// paths to the source share: the source and the first line.
	fmt.Printf("Z21 = j%.4f pu\n", imag(f.Entry(2, 1)))
	// Output:
	// Z21 = j0.3000 pu
}

func ExampleFactor_Path() {
	f, _ := radial().Factor()
	ws := f.NewWorkspace() // one per goroutine
	for k := 0; k < f.Size(); k++ {
		p := f.Path(k, ws)
		fmt.Printf("Z%d%d = j%.4f pu\n", k, k, imag(f.Dot(p, p)))
	}
	// Output:
	// Z00 = j0.1000 pu
	// Z11 = j0.3000 pu
	// Z22 = j0.5000 pu
}

func ExampleFactor_Column() {
	f, _ := radial().Factor()
	z := make([]complex128, f.Size())
	f.Column(z, 2) // the voltages for 1 pu injected at bus 2
	for i, v := range z {
		fmt.Printf("Z%d2 = j%.4f pu\n", i, imag(v))
	}
	// Output:
	// Z02 = j0.1000 pu
	// Z12 = j0.3000 pu
	// Z22 = j0.5000 pu
}

func ExampleFactor_Diagonal() {
	f, _ := radial().Factor()
	z := make([]complex128, f.Size())
	f.Diagonal(z)
	for k, v := range z {
		fmt.Printf("Z%d%d = j%.4f pu\n", k, k, imag(v))
	}
	// Output:
	// Z00 = j0.1000 pu
	// Z11 = j0.3000 pu
	// Z22 = j0.5000 pu
}

func ExampleSingularError() {
	b := sparse.NewBuilder(3)
	b.Add(0, 0, 1/0.1i)  // source at bus 0
	b.Add(0, 1, -1/0.2i) // line 0–1
	b.Add(0, 0, 1/0.2i)
	b.Add(1, 1, 1/0.2i)
	// Bus 2's line was forgotten: nothing ties it to the reference.
	_, err := b.Factor()
	var se *sparse.SingularError
	if errors.As(err, &se) {
		fmt.Println("floating bus:", se.Index)
	}
	// Output:
	// floating bus: 2
}
