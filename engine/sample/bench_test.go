package sample

import (
	"bufio"
	"os"
	"path/filepath"
	"runtime"
	"runtime/metrics"
	"strconv"
	"sync"
	"testing"
	"time"
)

// writeBenchTable writes a table of n samples and a dozen columns, in the
// fictional Corrie Vale and Marlow Fen catchments, with a few censored and
// missing cells. About 71 bytes a row: 700,000 rows make about 50 MB.
func writeBenchTable(path string, n int) (int64, error) {
	f, err := os.Create(path)
	if err != nil {
		return 0, err
	}
	w := bufio.NewWriter(f)
	w.WriteString("ID,Site,Date,Q (m3/s),pH,Na (mg/L),K (mg/L),Ca (mg/L),Mg (mg/L),Cl (mg/L),SO4 (mg/L),Alk (meq/L)\n")
	var b []byte
	day := time.Date(1990, 1, 1, 0, 0, 0, 0, time.UTC)
	x := uint32(12345)
	next := func(m uint32) int { x = x*1664525 + 1013904223; return int(x>>8) % int(m) }
	for i := 0; i < n; i++ {
		b = b[:0]
		b = strconv.AppendInt(b, int64(i), 36)
		if i%2 == 0 {
			b = append(b, ",CV,"...)
		} else {
			b = append(b, ",MF,"...)
		}
		b = day.Add(time.Duration(i)*time.Hour).AppendFormat(b, "2006-01-02T15:04")
		b = append(b, ',')
		b = strconv.AppendFloat(b, float64(next(50000))/1000, 'f', 3, 64)
		b = append(b, ',')
		b = strconv.AppendFloat(b, 5.5+float64(next(300))/100, 'f', 2, 64)
		for c := 0; c < 6; c++ {
			b = append(b, ',')
			switch v := next(2000); {
			case v == 0:
				b = append(b, "<0.05"...)
			case v == 1:
				b = append(b, "n.d."...)
			default:
				b = strconv.AppendFloat(b, float64(v)/100, 'f', 2, 64)
			}
		}
		b = append(b, ',')
		b = strconv.AppendFloat(b, float64(next(5000))/1000, 'f', 3, 64)
		b = append(b, '\n')
		w.Write(b)
	}
	if err := w.Flush(); err != nil {
		return 0, err
	}
	st, err := f.Stat()
	if err != nil {
		return 0, err
	}
	return st.Size(), f.Close()
}

// heapPeak samples the bytes of live and not yet collected heap objects
// every millisecond until stopped, and returns the highest value.
func heapPeak() (stop func() uint64) {
	var mu sync.Mutex
	var peak uint64
	done := make(chan struct{})
	var wg sync.WaitGroup
	wg.Add(1)
	sample := []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}}
	read := func() {
		metrics.Read(sample)
		v := sample[0].Value.Uint64()
		mu.Lock()
		peak = max(peak, v)
		mu.Unlock()
	}
	go func() {
		defer wg.Done()
		t := time.NewTicker(time.Millisecond)
		defer t.Stop()
		for {
			select {
			case <-done:
				return
			case <-t.C:
				read()
			}
		}
	}()
	return func() uint64 {
		close(done)
		wg.Wait()
		read()
		return peak
	}
}

func benchRead(b *testing.B, rows int) {
	path := filepath.Join(b.TempDir(), "bench.csv")
	size, err := writeBenchTable(path, rows)
	if err != nil {
		b.Fatal(err)
	}
	b.SetBytes(size)
	var peakX float64
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		b.StopTimer()
		runtime.GC()
		var ms runtime.MemStats
		runtime.ReadMemStats(&ms)
		base := ms.HeapAlloc
		f, err := os.Open(path)
		if err != nil {
			b.Fatal(err)
		}
		stop := heapPeak()
		b.StartTimer()
		t, err := Read(f, "bench.csv", Options{})
		b.StopTimer()
		peak := stop()
		f.Close()
		if err != nil || len(t.Samples) != rows || t.Problems.Err() != nil {
			b.Fatalf("read %d of %d rows: %v %v", len(t.Samples), rows, err, t.Problems.Err())
		}
		peakX = max(peakX, float64(peak-base)/float64(size))
		runtime.KeepAlive(t)
		b.StartTimer()
	}
	b.ReportMetric(float64(size)/1e6, "file-MB")
	b.ReportMetric(peakX*float64(size)/1e6, "peak-heap-MB")
	b.ReportMetric(peakX, "peak/file")
}

// BenchmarkRead50MB imports about 50 MB (700,000 rows of a dozen columns)
// from a file. Goal: under 3 s, peak heap under 4x the file size.
func BenchmarkRead50MB(b *testing.B) { benchRead(b, 700000) }

// BenchmarkRead1MB imports about 1 MB.
func BenchmarkRead1MB(b *testing.B) { benchRead(b, 14000) }
