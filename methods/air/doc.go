// Package air computes the density of moist air (CIPM-2007), dynamic
// pressure, and converts speeds and force units. It imports nothing else of
// liftfuse.
package air
