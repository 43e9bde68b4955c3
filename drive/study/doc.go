// Package study runs studies made of many runs: parameter sweeps (a point
// per run directory, resumable, with results.csv and pictures), single
// points of a sweep for array jobs and their collection, and the search
// for the onset of swimming (a scan and a bisection in one parameter,
// deterministic so that a stopped search repeats, with power-law and
// threshold fits and their verdict).
package study
