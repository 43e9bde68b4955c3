package record

import (
	"path/filepath"

	"axiswim/drive/flow"
	"axiswim/output"
)

// WriteMetrics writes the vortex rings of the mean flow to dir/metrics.csv.
func WriteMetrics(dir string, st *flow.Streaming) error {
	series, err := output.CreateSeries(filepath.Join(dir, "metrics.csv"), []output.Column{
		{Name: "ring"}, {Name: "z_m"}, {Name: "r_m"}, {Name: "circulation_m2_s"}, {Name: "streamfunction_m3_s"}, {Name: "sense", Doc: "+1 counter-clockwise (positive vorticity), -1 clockwise"},
	})
	if err != nil {
		return err
	}
	for i, r := range st.Rings {
		if err := series.Row(float64(i+1), r.Z, r.Rm, r.Circulation, r.Psi, r.SenseSign()); err != nil {
			series.Close()
			return err
		}
	}
	return series.Close()
}
