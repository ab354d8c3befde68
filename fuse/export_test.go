package fuse

// ScaleSpecText is scaleSpec for the external tests (package fuse_test).
var ScaleSpecText = scaleSpec
