// Package solver computes steady gradually-varied flow over a channel
// network: section hydraulics, normal and critical depth, water-surface
// profiles by the standard-step energy method with Manning friction,
// supercritical, subcritical and mixed regimes with hydraulic jumps located
// by specific force, gates, drops, culverts and junctions. It imports model
// and knows nothing of rules or output.
//
// # Using it
//
// Solve(m, Options{}) solves every event of a validated model and returns
// a Result: per event and reach the computed points (station, depth,
// water-surface elevation, velocity, Froude number, energy), the profile
// types (M1, S2, ...), the jumps and the notes. Every number of a result is
// finite; numerical trouble (no solution of the energy equation between
// two points, a control the flow cannot meet) is a Note, never a panic or
// a NaN. The error of Solve is only for the limits of untrusted input
// (ErrTooManyPoints, ErrWorkBudget). Options.Events restricts the events
// solved; a sensitivity run solves a copy of the model with scaled inputs.
//
// The section functions can be used alone: NewGeometry turns a model
// section into a Geometry whose Props gives area, wetted perimeter, top
// width, hydraulic radius, first moment and conveyance at a depth; on it
// NormalDepth, CriticalDepth, SequentDepth, SpecificEnergy, SpecificForce
// and FroudeNumber. Lengths are in the model's unit system (m or ft), and
// Manning's constant and gravity follow it.
//
// # Speed
//
// Section hydraulics and the standard step are the hot path: they do not
// allocate (BenchmarkProps, BenchmarkStep and BenchmarkChain1000 report
// allocs/op to keep it so). The rest is written for reading.
package solver
