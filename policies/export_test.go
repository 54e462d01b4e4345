package policies

// Internals the external tests of this package use.
var PackPrefix = packPrefix
