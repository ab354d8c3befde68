// Package methods holds what every measurement method shares: the campaign
// document (format 1) and its strict loader, units and air density, and the
// Evidence seam that each method adapter fills and the fusion step reads.
//
// The adapters live below it (methods/height, methods/pressure,
// methods/vortex); the streaming log reader is methods/logs. Nothing here
// computes a posterior: that is package fuse.
package methods
