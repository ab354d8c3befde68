// Package campaign is the campaign document, format 1: its types (keys as in
// campaign-format.md), a strict YAML decoder that records where every key
// stood, the one place defaults are applied, every validation rule, the
// files a campaign reads (logs' headers and bodies, tap and reading tables),
// and Load. Problems carry file:line:column and wrap a sentinel.
//
// Nothing here reduces a measurement or computes a posterior: the adapters
// are methods/height, methods/pressure and methods/vortex, listed in package
// methods; fusion is package fuse.
package campaign
