package flux

import (
	"math/rand/v2"

	"lixiv/engine/internal/portable"
)

// The Monte Carlo path must give the same bits natively and under
// WebAssembly; these are the engine's portable functions (package
// internal/portable) under the short names the flux code uses.

// pexp is portable.Exp.
func pexp(x float64) float64 { return portable.Exp(x) }

// plog is portable.Log.
func plog(x float64) float64 { return portable.Log(x) }

// normal is portable.Normal.
func normal(rng *rand.Rand) float64 { return portable.Normal(rng) }
