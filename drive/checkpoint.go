package drive

import (
	"bytes"
	"crypto/sha256"
	"encoding/gob"
	"encoding/hex"
	"errors"
	"fmt"
	"os"

	"axiswim/lbm"
	"axiswim/output"
)

// CheckpointFormat names the checkpoint file format; CheckpointVersion
// changes whenever its content does, and a checkpoint of another version
// is refused.
const (
	CheckpointFormat  = "axiswim checkpoint"
	CheckpointVersion = 1
	CheckpointFile    = "checkpoint.bin"
)

// checkpointHeader leads every checkpoint: what it is, which case it
// belongs to (the SHA-256 of the resolved case.toml) and the SHA-256 of the
// payload that follows.
type checkpointHeader struct {
	Format   string
	Version  int
	CaseHash string
	Sum      string
	Step     int64
}

// runState is everything a run needs to continue bit for bit.
type runState struct {
	Lattice lbm.LatticeState
	Bodies  []bodyState
	Mass    massState
	Mass0   float64

	Tracker *trackerState
	Fields  *recorderState
	Hist    history
	Summary summaryState
	// byte lengths of the CSV files at the checkpoint
	SeriesBytes, PeriodsBytes int64
	NextSample                int
	// Warm is how the run started (nil: from rest, no warm start asked).
	Warm *WarmStart
	// WarmDrive is the drive the ramp of a warm start starts from.
	WarmDrive *Shaker
}

type bodyState struct {
	Z, V, VPrev                       float64
	LinkForce, NodeForce, NodeImpulse float64
	Spread                            []float64
	Tick, Covered, Uncovered          int
}

type massState struct {
	Every          int
	Rho0           float64
	Drift, Applied float64
	N              int
}

type trackerState struct {
	N           int
	Drive, Ramp complex128
	Ext, Body   []complex128
	Lo, Hi, Z0  []float64
	Centroids   []float64
	Rows        []rowState
	// several swimmers (absent from checkpoints of earlier versions)
	Swim, Gaps [][]float64
	GapMin     []float64
	MinGap     float64
	MinPair    [2]int
	HasMinGap  bool
}

type rowState struct {
	Period                    int
	Time, Centroid, Displ     float64
	ExtAmp, ExtPhase, BodyAmp []float64
	BodyPhase                 []float64
	Swim, Gaps                []float64
}

type averageState struct {
	Uz, Ur, Rho []float64
	Samples     int
	Covered     []bool
}

type recorderState struct {
	Mean   averageState
	Phase  []averageState
	Snaps  []output.CollectionEntry
	Frames []frameState
}

type frameState struct {
	Field, Psi []float64
	Spheres    []output.Circle
	Title      string
}

type summaryState struct {
	MaxMach, MaxMassDrift, FinalMaxSpeed float64
}

// HashCase returns the SHA-256 of a resolved case file, hex.
func HashCase(toml []byte) string {
	h := sha256.Sum256(toml)
	return hex.EncodeToString(h[:])
}

// writeCheckpoint encodes st and writes it atomically: the previous
// checkpoint stays in place until the new one is complete.
func writeCheckpoint(path, caseHash string, st *runState) error {
	var payload bytes.Buffer
	if err := gob.NewEncoder(&payload).Encode(st); err != nil {
		return fmt.Errorf("checkpoint: %w", err)
	}
	sum := sha256.Sum256(payload.Bytes())
	var out bytes.Buffer
	hdr := checkpointHeader{Format: CheckpointFormat, Version: CheckpointVersion, CaseHash: caseHash,
		Sum: hex.EncodeToString(sum[:]), Step: st.Lattice.Steps}
	if err := gob.NewEncoder(&out).Encode(hdr); err != nil {
		return fmt.Errorf("checkpoint: %w", err)
	}
	out.Write(payload.Bytes())
	return output.WriteFileAtomic(path, out.Bytes())
}

// readCheckpoint reads and checks a checkpoint for the case with the given
// hash.
func readCheckpoint(path, caseHash string) (*runState, error) {
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, fmt.Errorf("read checkpoint: %w", err)
	}
	r := bytes.NewReader(data)
	var hdr checkpointHeader
	if err := gob.NewDecoder(r).Decode(&hdr); err != nil || hdr.Format != CheckpointFormat {
		return nil, fmt.Errorf("%s is not an axiswim checkpoint", path)
	}
	if hdr.Version != CheckpointVersion {
		return nil, fmt.Errorf("%s is a checkpoint of format version %d; this axiswim reads version %d: rerun the case from the start",
			path, hdr.Version, CheckpointVersion)
	}
	if hdr.CaseHash != caseHash {
		return nil, errors.New("the checkpoint belongs to another case than the case.toml beside it: " +
			"restore the case.toml the run was started with, or rerun from the start")
	}
	payload := data[len(data)-r.Len():]
	sum := sha256.Sum256(payload)
	if hex.EncodeToString(sum[:]) != hdr.Sum {
		return nil, fmt.Errorf("%s is damaged (checksum mismatch); rerun from the start", path)
	}
	var st runState
	if err := gob.NewDecoder(bytes.NewReader(payload)).Decode(&st); err != nil {
		return nil, fmt.Errorf("decode checkpoint: %w", err)
	}
	return &st, nil
}
