package evidence_test

import (
	"errors"
	"math"
	"testing"

	"gonum.org/v1/gonum/mat"

	"liftfuse/methods/evidence"
)

func obs(label string) evidence.Obs {
	return evidence.Obs{Y: 1, Terms: []evidence.Term{{Config: "c", Axle: evidence.AxleFront, W: 1}}, Air: evidence.Airspeed{Q: 100}, Label: label}
}

func TestDiagonal(t *testing.T) {
	tests := []struct {
		name    string
		sd      []float64
		wantErr bool
	}{
		{"two windows", []float64{0.5, 2}, false},
		{"zero sd", []float64{0.5, 0}, true},
		{"infinite sd", []float64{math.Inf(1), 1}, true},
		{"count mismatch", []float64{1}, true},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			b, err := evidence.Diagonal([]evidence.Obs{obs("a"), obs("b")}, tt.sd)
			if (err != nil) != tt.wantErr {
				t.Fatalf("err = %v, want error %v", err, tt.wantErr)
			}
			if err != nil {
				if !errors.Is(err, evidence.ErrBadEvidence) {
					t.Errorf("error %v does not wrap ErrBadEvidence", err)
				}
				return
			}
			if b.Cov != nil || len(b.Var) != 2 {
				t.Fatalf("a diagonal block keeps its variances only, got Cov %v Var %v", b.Cov, b.Var)
			}
			for i := range 2 {
				for j := range 2 {
					want := 0.0
					if i == j {
						want = tt.sd[i] * tt.sd[i]
					}
					if got := b.At(i, j); got != want {
						t.Errorf("At(%d, %d) = %g, want %g", i, j, got, want)
					}
				}
			}
		})
	}
}

func TestCheckBlocks(t *testing.T) {
	full := mat.NewSymDense(2, []float64{1, 0.5, 0.5, 1})
	diag, err := evidence.Diagonal([]evidence.Obs{obs("a"), obs("b")}, []float64{1, 1})
	if err != nil {
		t.Fatal(err)
	}
	fullBlock, err := evidence.NewBlock([]evidence.Obs{obs("a"), obs("b")}, full)
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name    string
		block   evidence.Block
		wantErr bool
	}{
		{"diagonal", diag, false},
		{"full", fullBlock, false},
		{"both kinds", evidence.Block{Obs: diag.Obs, Cov: full, Var: diag.Var}, true},
		{"neither", evidence.Block{Obs: diag.Obs}, true},
		{"variances of the wrong length", evidence.Block{Obs: diag.Obs, Var: []float64{1}}, true},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			e := evidence.Evidence{Entry: "e", Kind: evidence.KindRideHeight, Blocks: []evidence.Block{tt.block},
				Informs: []evidence.Quantity{{Config: "c", Axle: evidence.AxleFront}}}
			if err := e.Check(); (err != nil) != tt.wantErr {
				t.Errorf("Check() = %v, want error %v", err, tt.wantErr)
			}
		})
	}
}

func TestNewBlockRefusesIndefinite(t *testing.T) {
	// A correlation above 1 is no covariance (common practice (no source)).
	cov := mat.NewSymDense(2, []float64{1, 2, 2, 1})
	if _, err := evidence.NewBlock([]evidence.Obs{obs("a"), obs("b")}, cov); !errors.Is(err, evidence.ErrBadEvidence) {
		t.Errorf("indefinite covariance accepted: %v", err)
	}
}

// TestCheckLogNormal: a log-normal nuisance needs a positive median and a
// log-sd ≥ 0 (0: stated exactly), and is not a wind.
func TestCheckLogNormal(t *testing.T) {
	tests := []struct {
		name    string
		n       evidence.Nuisance
		asWind  bool
		wantErr bool
	}{
		{"stated to ±20 %", evidence.Nuisance{Name: "m", Mean: 0.12, SD: 0.2, LogNormal: true}, false, false},
		{"stated exactly", evidence.Nuisance{Name: "m", Mean: 0.12, LogNormal: true}, false, false},
		{"zero median", evidence.Nuisance{Name: "m", SD: 0.2, LogNormal: true}, false, true},
		{"negative log-sd", evidence.Nuisance{Name: "m", Mean: 0.12, SD: -0.2, LogNormal: true}, false, true},
		{"also flat", evidence.Nuisance{Name: "m", Mean: 0.12, SD: 0.2, LogNormal: true, Flat: true}, false, true},
		{"as the wind", evidence.Nuisance{Name: "m", Mean: 0.12, SD: 0.2, LogNormal: true}, true, true},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			o := obs("a")
			o.Nuis = []evidence.Coef{{Name: "m", C: -100, PerQ: true}}
			if tt.asWind {
				o.Air.Wind = "m"
			}
			b, err := evidence.Diagonal([]evidence.Obs{o}, []float64{1})
			if err != nil {
				t.Fatal(err)
			}
			e := evidence.Evidence{Entry: "e", Kind: evidence.KindPressure, Blocks: []evidence.Block{b}, Nuisances: []evidence.Nuisance{tt.n}}
			if err := e.Check(); (err != nil) != tt.wantErr {
				t.Errorf("Check() = %v, want error %v", err, tt.wantErr)
			}
		})
	}
}

// TestCheckNamesItem: Check's message names the observation or the sign
// at fault by its quoted label (common practice (no source): a message
// says where the fault is).
func TestCheckNamesItem(t *testing.T) {
	bad := obs(`window "3"`)
	bad.Y = math.NaN()
	noTerms := obs("w7")
	noTerms.Terms = nil
	diag := func(o evidence.Obs) evidence.Block {
		b, err := evidence.Diagonal([]evidence.Obs{obs("a"), o}, []float64{1, 1})
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	tests := []struct {
		name string
		e    evidence.Evidence
		want string
	}{
		{"observation not finite", evidence.Evidence{Entry: "e", Blocks: []evidence.Block{diag(bad)}},
			`malformed evidence: entry "e": observation "window \"3\"" is not finite`},
		{"observation without terms", evidence.Evidence{Entry: "e", Blocks: []evidence.Block{diag(noTerms)}},
			`malformed evidence: entry "e": observation "w7" sees no lift parameter`},
		{"sign with a bad misread", evidence.Evidence{Entry: "e", Signs: []evidence.Sign{{Label: "tuft 2", Misread: 0.7, Softness: 1,
			Terms: obs("").Terms, Air: evidence.Airspeed{Q: 100}}}},
			`malformed evidence: entry "e": sign "tuft 2" needs misread in [0, 0.5) and softness > 0`},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			err := tt.e.Check()
			if err == nil || err.Error() != tt.want {
				t.Errorf("Check() = %v, want %s", err, tt.want)
			}
		})
	}
}
