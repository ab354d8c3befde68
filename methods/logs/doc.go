// Package logs reads sampled test-day logs (comma-separated, one header row)
// as a stream: memory does not grow with the length of the file, and every
// bad cell is an error naming the file, line and column.
package logs
