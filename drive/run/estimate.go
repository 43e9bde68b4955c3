package run

import (
	"math"

	"axiswim/cases"
)

// sampleSteps returns the steps at which the series is sampled: evenly in
// each drive period for a shaken case, every sample interval otherwise,
// and always the last step.
func sampleSteps(c *cases.Case, l *cases.Lattice) []int64 {
	var out []int64
	if l.StepsPerPeriod > 0 {
		per := max(1, c.Run.SamplesPerPeriod)
		for p := 0; p < l.Steps/l.StepsPerPeriod; p++ {
			for k := 1; k <= per; k++ {
				out = append(out, int64(p*l.StepsPerPeriod+k*l.StepsPerPeriod/per))
			}
		}
	} else {
		every := int64(math.Max(1, math.Round(c.Run.SampleInterval/l.Dt)))
		for n := every; n <= int64(l.Steps); n += every {
			out = append(out, n)
		}
	}
	if len(out) == 0 || out[len(out)-1] != int64(l.Steps) {
		out = append(out, int64(l.Steps))
	}
	w := 0
	for i, n := range out {
		if i == 0 || n > out[w-1] {
			out[w] = n
			w++
		}
	}
	return out[:w]
}

// EstimateOutput returns the bytes a run of c on l is expected to write:
// the series and periods files, the VTK fields (snapshots, phase averages
// and the mean, five arrays of 64-bit values, seven values a node, twice
// as many rows when mirrored), the pictures (about 300 kB each) and the
// checkpoint (the populations and the field accumulators). On refined
// levels the fields are those of the uniform image (cases.Lattice.Image),
// each snapshot is written as the levels too, and the populations are those
// of every level.
func EstimateOutput(c *cases.Case, l *cases.Lattice) int64 {
	im := l.Image(l.ImageCells(c.Output.ImageSpacing))
	nodes := int64(im.Nz) * int64(im.Nr)
	pops := 9 * (int64(l.Nz) + 2) * (int64(l.Nr) + 2)
	var levelNodes int64 // the levels' own cells, written with each snapshot
	if l.Levels > 1 {
		pops = 0
		for _, lev := range l.Layout().Levels {
			pops += 9 * (int64(lev.Nz) + 2) * (int64(lev.Nr) + 2)
			levelNodes += int64(lev.Nz) * int64(lev.Nr)
		}
	}
	cols := int64(8 + 3*len(c.Spheres) + len(c.Springs))
	samples := int64(len(sampleSteps(c, l)))
	total := samples * cols * 18 // about 18 characters a number
	if l.StepsPerPeriod == 0 {
		return total + 9*8*nodes
	}
	periods := int64(l.Steps / l.StepsPerPeriod)
	total += periods * int64(4+2*len(c.Springs)+2*len(c.Spheres)) * 18
	o := c.Output
	if o.VTK {
		snaps := int64(o.SnapshotsPerPeriod * min(o.SnapshotPeriods, int(periods)))
		files := snaps + int64(o.SnapshotsPerPeriod+1)
		per, perLevels := nodes*7*8, levelNodes*7*8
		if o.Mirror {
			per, perLevels = 2*per, 2*perLevels
		}
		total += files*per + snaps*perLevels
	}
	if o.Pictures && len(c.Spheres) > 0 {
		total += int64(4+o.SnapshotsPerPeriod) * 300 << 10
	}
	accum := int64(3 * (1 + o.SnapshotsPerPeriod))
	total += (pops + accum*nodes + 2*int64(o.SnapshotsPerPeriod)*nodes) * 8
	return total
}
