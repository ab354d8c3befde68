// Package report lays out what package fuse returns: the customer
// development report (PDF), the result document (JSON) and terminal tables.
// It computes no statistics of its own.
package report
