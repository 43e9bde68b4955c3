package run

import (
	"bytes"
	"crypto/sha256"
	"encoding/gob"
	"encoding/hex"
	"math"
	"os"
	"path/filepath"
	"reflect"
	"testing"

	"axiswim/drive"
	"axiswim/drive/record"
	"axiswim/lbm"
	"axiswim/output"
)

// fuzzCheckpointHash stands for the hash of the case a checkpoint belongs
// to; readCheckpoint only compares it.
var fuzzCheckpointHash = HashCase([]byte("[fluid]\ndensity = 1000.0\n# a case for FuzzReadCheckpoint\n"))

// fuzzCheckpointState is a small run state with a value in every part, as
// writeCheckpoint would be given during a run.
func fuzzCheckpointState() *runState {
	st := &runState{
		Lattice: lbm.LatticeState{Steps: 1234, Solid: []bool{false, true, true, false}},
		Bodies: []drive.BodyState{
			{Z: 12.5, V: 1e-3, VPrev: 9e-4, LinkForce: -2e-5, NodeForce: 3e-6, NodeImpulse: 1e-7,
				Spread: []float64{0.1, 0.2}, Tick: 3, Covered: 2, Uncovered: 1},
			{Z: 30.25, V: -1e-3}, // gob would read an empty Spread back as nil
		},
		Mass:  drive.MassState{Every: 200, Rho0: 1, Drift: 1e-12, Applied: -3e-13, N: 6},
		Mass0: 4321.5,
		Tracker: &record.PeriodsState{
			N: 2, Drive: complex(1, -2), Ramp: complex(0.5, 0),
			Ext: []complex128{1 + 1i}, Body: []complex128{2 - 1i, 0.25i},
			Lo: []float64{-1}, Hi: []float64{1}, Z0: []float64{0}, Centroids: []float64{0.5, 0.75},
			Rows: []record.RowState{{Period: 1, Time: 0.05, Centroid: 0.6, Displ: 1e-4,
				ExtAmp: []float64{1e-3}, ExtPhase: []float64{math.Pi / 2}, BodyAmp: []float64{2e-3}, BodyPhase: []float64{-1}}},
		},
		Fields: &record.FieldsState{
			Mean:   record.AverageState{Uz: []float64{1, 2}, Ur: []float64{3, 4}, Rho: []float64{1, 1}, Samples: 5, Covered: []bool{true, false}},
			Phase:  []record.AverageState{{Uz: []float64{0.5}, Samples: 1}},
			Snaps:  []output.CollectionEntry{{Time: 0.1, File: "fields/snapshot_p0001_00.vti"}},
			Frames: []record.FrameState{{Field: []float64{0, 1}, Psi: []float64{2, 3}, Spheres: []output.Circle{{Z: 0.001, Radius: 0.0005}}, Title: "t = 0.1 s"}},
		},
		Hist:         record.History{T: []float64{0, 0.1}, Drive: []float64{0, 1}, Centroid: []float64{0, 0}, Ext: []float64{1, 1}},
		Summary:      summaryState{MaxMach: 0.01, MaxMassDrift: 1e-12, FinalMaxSpeed: math.Inf(1)},
		SeriesBytes:  1024,
		PeriodsBytes: 256,
		NextSample:   7,
	}
	for i := range st.Lattice.Pops {
		st.Lattice.Pops[i] = []float64{float64(i), -float64(i) / 9, 1e-300, 0}
	}
	return st
}

// fuzzCheckpointFile wraps payload in a header that readCheckpoint accepts:
// the right format, version and case hash, and the payload's checksum. It
// lets the fuzzer reach the decoding of the payload, which a checksum
// guards in a file as written.
func fuzzCheckpointFile(payload []byte) ([]byte, error) {
	sum := sha256.Sum256(payload)
	hdr := checkpointHeader{Format: CheckpointFormat, Version: CheckpointVersion, CaseHash: fuzzCheckpointHash,
		Sum: hex.EncodeToString(sum[:])}
	var out bytes.Buffer
	if err := gob.NewEncoder(&out).Encode(hdr); err != nil {
		return nil, err
	}
	out.Write(payload)
	return out.Bytes(), nil
}

// FuzzReadCheckpoint feeds damaged and hostile checkpoint files to
// readCheckpoint, which must answer with an error or a state, never panic.
// With wrap false the input is the whole file; with wrap true it is the
// payload, put behind a valid header with its checksum
// (fuzzCheckpointFile), so that the gob decoding of the run state is
// fuzzed too and not only the header and the checksum test.
//
// Seeds: a real checkpoint written by writeCheckpoint, truncated and
// corrupted copies of it, and the files in
// testdata/fuzz/FuzzReadCheckpoint.
func FuzzReadCheckpoint(f *testing.F) {
	dir := f.TempDir()
	orig := fuzzCheckpointState()
	real := filepath.Join(dir, CheckpointFile)
	if err := writeCheckpoint(real, fuzzCheckpointHash, orig); err != nil {
		f.Fatal(err)
	}
	data, err := os.ReadFile(real)
	if err != nil {
		f.Fatal(err)
	}
	// The seed is a real checkpoint: it reads back equal, and only for
	// its own case.
	st, err := readCheckpoint(real, fuzzCheckpointHash)
	if err != nil {
		f.Fatalf("reading the checkpoint just written: %v", err)
	}
	if !reflect.DeepEqual(st, orig) {
		f.Fatalf("checkpoint read back\n got %+v\nwant %+v", st, orig)
	}
	if _, err := readCheckpoint(real, HashCase([]byte("another case"))); err == nil {
		f.Fatal("a checkpoint was read for another case")
	}
	// Split it as readCheckpoint does: the header, then the payload.
	r := bytes.NewReader(data)
	var hdr checkpointHeader
	if err := gob.NewDecoder(r).Decode(&hdr); err != nil {
		f.Fatal(err)
	}
	nhdr := len(data) - r.Len()
	payload := data[nhdr:]
	flip := func(b []byte, i int) []byte {
		c := bytes.Clone(b)
		c[i] ^= 0x5a
		return c
	}
	otherVersion := func() []byte {
		h := hdr
		h.Version = CheckpointVersion + 1
		var out bytes.Buffer
		if err := gob.NewEncoder(&out).Encode(h); err != nil {
			f.Fatal(err)
		}
		return append(out.Bytes(), payload...)
	}
	path := filepath.Join(dir, "fuzz-"+CheckpointFile) // a worker runs one input at a time
	read := func(in []byte, wrap bool) (*runState, error) {
		file := in
		if wrap {
			var err error
			if file, err = fuzzCheckpointFile(in); err != nil {
				return nil, err
			}
		}
		if err := os.WriteFile(path, file, 0o644); err != nil {
			return nil, err
		}
		return readCheckpoint(path, fuzzCheckpointHash)
	}

	// What readCheckpoint must make of each seed: accept it, refuse it,
	// or either (a damaged gob may still decode).
	const accept, refuse, either = "accept", "refuse", "either"
	seeds := []struct {
		what string
		in   []byte
		wrap bool
		want string
	}{
		{"the checkpoint as written", data, false, accept},
		{"header only", data[:nhdr], false, refuse},
		{"cut inside the header", data[:nhdr/2], false, refuse},
		{"cut inside the payload", data[:len(data)/2], false, refuse},
		{"last byte missing", data[:len(data)-1], false, refuse},
		{"damaged header", flip(data, nhdr/2), false, refuse},
		{"damaged payload (checksum mismatch)", flip(data, len(data)-3), false, refuse},
		{"another format version", otherVersion(), false, refuse},
		{"trailing bytes", append(bytes.Clone(data), 0, 1, 2), false, refuse},
		{"empty file", []byte{}, false, refuse},
		{"payload as written", payload, true, accept},
		{"payload cut", payload[:len(payload)/2], true, refuse},
		{"payload damaged", flip(payload, len(payload)/3), true, either},
		{"a gob of another type as payload", data[:nhdr], true, refuse},
		{"empty payload", []byte{}, true, refuse},
	}
	for _, sd := range seeds {
		st, err := read(sd.in, sd.wrap)
		switch {
		case sd.want == accept && err != nil:
			f.Errorf("%s: refused: %v", sd.what, err)
		case sd.want == accept && !reflect.DeepEqual(st, orig):
			f.Errorf("%s: read back a different state", sd.what)
		case sd.want == refuse && err == nil:
			f.Errorf("%s: accepted", sd.what)
		}
		f.Add(sd.in, sd.wrap)
	}

	f.Fuzz(func(t *testing.T, in []byte, wrap bool) {
		st, err := read(in, wrap)
		if (st == nil) == (err == nil) {
			t.Fatalf("readCheckpoint returned state %v and error %v: want exactly one", st != nil, err)
		}
	})
}
