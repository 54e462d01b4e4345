//go:build !unix

package model

import "time"

// processCPU is not measured here: decode-share-cpu reports 0.
func processCPU() time.Duration { return 0 }
