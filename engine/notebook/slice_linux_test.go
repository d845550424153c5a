//go:build linux

package notebook

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"
)

// BenchmarkLongestSlice computes the demo at 40,000 draws (the timing
// harness's long run), quick pass first and the inversions on a Farm, as
// the page does, and reports the longest stretch of CPU time the
// computing goroutine spends between two progress reports (slice-ms),
// not counting the waits for the farm: how long the page's thread would
// go without a chance to hand itself back, natively (WebAssembly takes
// three to four times as long). CPU time of the goroutine's thread leaves
// out what other processes take. With -v it logs where the longest
// stretches begin and end.
func BenchmarkLongestSlice(b *testing.B) {
	data, err := os.ReadFile(filepath.Join("..", "..", "examples", "corrie-vale", "corrie-vale.lixiv.json"))
	if err != nil {
		b.Fatal(err)
	}
	runtime.LockOSThread()
	defer runtime.UnlockOSThread()
	for b.Loop() {
		d, err := Parse(data, "corrie-vale.lixiv.json")
		if err != nil {
			b.Fatal(err)
		}
		if err := d.SetParam("apportionment", "draws", "40000"); err != nil {
			b.Fatal(err)
		}
		sl := &stretches{tid: syscall.Gettid()}
		d.Quick = true
		d.Farm = &waitingFarm{copies: copies{n: 2, fail: -1}, s: sl}
		sl.mark()
		for more := true; more; {
			if more, err = d.Step(context.Background(), func(p Progress) { sl.report(p.Cell) }); err != nil {
				b.Fatal(err)
			}
			sl.mark()
		}
		b.ReportMetric(sl.longest.Seconds()*1000, "slice-ms")
		b.Logf("longest slice %.1f ms in %s\n  from %s\n  to   %s", sl.longest.Seconds()*1000, sl.cell, sl.from, sl.to)
	}
}

// stretches measures the CPU time of the computing thread (tid) between
// reports; reports and waits on other threads (the farm's) are left out.
type stretches struct {
	tid            int
	mu             sync.Mutex
	last           time.Duration
	where          string
	longest        time.Duration
	cell, from, to string
}

// threadCPU returns the CPU time the calling thread has used.
func threadCPU() time.Duration {
	var ru syscall.Rusage
	const rusageThread = 1 // Linux's RUSAGE_THREAD
	if err := syscall.Getrusage(rusageThread, &ru); err != nil {
		panic(err)
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// mark starts a slice (a report, or the end of a wait for the farm).
func (s *stretches) mark() {
	if syscall.Gettid() != s.tid {
		return
	}
	s.mu.Lock()
	s.last, s.where = threadCPU(), "a wait or a step's start"
	s.mu.Unlock()
}

// report ends the slice at a progress report of cell and starts the next.
func (s *stretches) report(cell string) {
	if syscall.Gettid() != s.tid {
		return
	}
	now, w := threadCPU(), caller()
	s.mu.Lock()
	defer s.mu.Unlock()
	if d := now - s.last; d > s.longest {
		s.longest, s.cell, s.from, s.to = d, cell, s.where, w
	}
	s.last, s.where = now, w
}

// caller names the engine's functions on the stack of a progress report.
func caller() string {
	pc := make([]uintptr, 16)
	fr := runtime.CallersFrames(pc[:runtime.Callers(3, pc)])
	var names []string
	for len(names) < 4 {
		f, more := fr.Next()
		if strings.Contains(f.Function, "lixiv/engine/") && !strings.Contains(f.Function, "Report") && !strings.Contains(f.Function, "Benchmark") {
			names = append(names, fmt.Sprintf("%s:%d", f.Function[strings.LastIndex(f.Function, "/")+1:], f.Line))
		}
		if !more {
			break
		}
	}
	return strings.Join(names, " < ")
}

// waitingFarm is copies whose wait for a job starts a new slice, as the
// page's waits for its workers do.
type waitingFarm struct {
	copies
	s *stretches
}

func (f *waitingFarm) Work(ctx context.Context, job FarmJob, samples []int, put func(int, []byte) error, progress func(float64)) error {
	err := f.copies.Work(ctx, job, samples, put, progress)
	f.s.mark()
	return err
}
