// Package examples holds the bundled demo campaigns (an invented scenario)
// so that `liftfuse init` can write one out. The generator that made them
// is examples/gen.
package examples

import "embed"

// Demo is the demo campaign folder, rooted at its own files.
//
//go:embed ducktail-fastback
var demo embed.FS

// DemoName is the folder name of the demo campaign.
const DemoName = "ducktail-fastback"

// Demo returns the demo campaign's files.
func Demo() embed.FS { return demo }
