package checks

// LoadForTest loads a package document with the default options; the
// external test package sets it to load.Load, which this package cannot
// import.
var LoadForTest func(doc []byte) (*Study, error)
