package policies

// Internals the external tests of this package use.
var (
	FormatNumber = formatNumber
	PackPrefix   = packPrefix
)
