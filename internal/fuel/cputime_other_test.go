//go:build !unix

package fuel

import "time"

// cpuTime is not read on this system: the benchmarks report wall time only.
func cpuTime() time.Duration { return 0 }
