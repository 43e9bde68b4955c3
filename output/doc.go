// Package output writes what a run produces: the run directory, CSV series
// with units in their headers, the JSON summary, and progress on the
// terminal. Files are written so that nothing a user wrote or an earlier
// run produced is overwritten without being asked to (see RunDir).
package output
