package watchdog

import (
	"os"
	"os/exec"
	"runtime"
	"strings"
	"testing"
	"time"
)

// TestFires runs itself as a child process that arms two watchdogs, disarms
// the first and then blocks: the child must die naming the second input
// only. The parent waits for the child however long it takes.
func TestFires(t *testing.T) {
	if os.Getenv("LIXIV_WATCHDOG_CHILD") == "1" {
		stop := start("disarmed input", time.Millisecond)
		stop()
		time.Sleep(20 * time.Millisecond) // were it still armed, it would fire here
		start("stalling input", time.Millisecond)
		select {}
	}
	if runtime.GOOS == "js" {
		t.Skip("WebAssembly under Node runs no child processes")
	}
	cmd := exec.Command(os.Args[0], "-test.run=^TestFires$")
	cmd.Env = append(os.Environ(), "LIXIV_WATCHDOG_CHILD=1")
	out, err := cmd.CombinedOutput()
	if err == nil {
		t.Fatalf("the child ended cleanly:\n%s", out)
	}
	if !strings.Contains(string(out), `"stalling input"`) || strings.Contains(string(out), "disarmed input") {
		t.Errorf("the child's output should name the stalling input only:\n%s", out)
	}
}
