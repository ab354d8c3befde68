// Command liftfuse reconciles on-road evidence of a car's aerodynamic lift
// from several measurement methods. See README.md.
package main

import (
	"os"
)

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}
