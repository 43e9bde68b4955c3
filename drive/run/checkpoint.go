package run

import (
	"bytes"
	"crypto/sha256"
	"encoding/gob"
	"encoding/hex"
	"errors"
	"fmt"
	"os"

	"axiswim/drive"
	"axiswim/drive/record"
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

// runState is everything a run needs to continue bit for bit. The first
// four fields are the simulation's (drive.State); gob matches fields by
// name, so they stay at the top level as in version 1 of the format.
type runState struct {
	Lattice lbm.LatticeState
	Levels  *lbm.LevelsState // refined levels (nil on one lattice; absent from older checkpoints)

	LevelMoves, LevelShift int
	Bodies                 []drive.BodyState
	Mass                   drive.MassState
	Mass0                  float64

	Tracker *record.PeriodsState
	Fields  *record.FieldsState
	Hist    record.History
	Summary summaryState
	// byte lengths of the CSV files at the checkpoint
	SeriesBytes, PeriodsBytes int64
	NextSample                int
	// Warm is how the run started (nil: from rest, no warm start asked).
	Warm *WarmStart
	// WarmDrive is the drive the ramp of a warm start starts from.
	WarmDrive *drive.Shaker
}

// simulation returns the simulation's part of the state.
func (st *runState) simulation() drive.State {
	return drive.State{Lattice: st.Lattice, Levels: st.Levels, LevelMoves: st.LevelMoves, LevelShift: st.LevelShift,
		Bodies: st.Bodies, Mass: st.Mass, Mass0: st.Mass0}
}

// setSimulation stores the simulation's part of the state.
func (st *runState) setSimulation(s drive.State) {
	st.Lattice, st.Levels, st.Bodies, st.Mass, st.Mass0 = s.Lattice, s.Levels, s.Bodies, s.Mass, s.Mass0
	st.LevelMoves, st.LevelShift = s.LevelMoves, s.LevelShift
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
		Sum: hex.EncodeToString(sum[:]), Step: st.simulation().Steps()}
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
