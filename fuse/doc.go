// Package fuse turns the Evidence of every method entry into a joint
// posterior over front and rear lift, what each method says on its own,
// where the methods disagree, and what to measure next. It reads only
// methods.Evidence, never a campaign file or a log.
package fuse
