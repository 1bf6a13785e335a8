package slurm

import (
	"bytes"
	"context"
	"crypto/rand"
	"errors"
	"fmt"
	"net"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"syscall"
	"testing"
	"time"
)

// The model and the grids of the test. lorenz-classic.lya has stable and
// unstable equilibria over this range of r (Strogatz, Nonlinear Dynamics and
// Chaos, §9.2), so the lines carry every verdict. The grid is spelled the
// way sweep.sh takes it (LYACERT_GRID), in one place.
const (
	modelFile = "lorenz-classic.lya"
	smallGrid = "--grid r=1/2..30 --points 301"
	// Large enough that one shard of three runs for a few seconds with one
	// worker (about 500 points/s), so that it can be stopped mid-run.
	largeGrid = "--grid r=1/2..30 --points 9001"
	shards    = 3
)

// Bounds of every wait, generous for a shared two-core machine.
const (
	startWait = 60 * time.Second
	jobWait   = 4 * time.Minute
	cmdWait   = 2 * time.Minute
)

func TestArrayJob(t *testing.T) {
	if os.Getenv("LYACERT_SLURM") != "1" {
		t.Skip("set LYACERT_SLURM=1 to run the Slurm array job on a real single-node Slurm (needs root, slurmctld, slurmd, slurm-client and munge; .ci/run does)")
	}
	c := startCluster(t)
	bin := buildLyacert(t, c.root)

	t.Run("complete", func(t *testing.T) {
		dir := c.workDir(t, "complete")
		env := []string{"LYACERT=" + bin, "LYACERT_MODEL=" + modelFile, "LYACERT_GRID=" + smallGrid}
		job := c.submit(t, dir, env, fmt.Sprintf("--array=0-%d", shards-1))
		states := c.waitDone(t, job, shards)
		for task, st := range states {
			if st != "COMPLETED" {
				t.Errorf("array task %s ended %s, want COMPLETED\n%s", task, st, readTail(filepath.Join(dir, fmt.Sprintf("sweep-%s.log", task))))
			}
		}
		checkMerged(t, c, bin, dir, smallGrid)
	})

	t.Run("killed-and-continued", func(t *testing.T) {
		dir := c.workDir(t, "killed")
		env := []string{"LYACERT=" + bin, "LYACERT_MODEL=" + modelFile, "LYACERT_GRID=" + largeGrid}
		job := c.submit(t, dir, env, fmt.Sprintf("--array=0-%d", shards-1))

		// Task 1: cancelled while it runs, then submitted again alone
		// (the shard count given, since an array of one has count 1).
		c.waitPartial(t, dir, 1)
		c.run(t, "scancel", job+"_1")
		if st := c.waitTask(t, job, 1); st != "CANCELLED" {
			t.Fatalf("array task %s_1 ended %s after scancel, want CANCELLED", job, st)
		}
		requireInterrupted(t, dir, 1)

		// Task 2: requeued while it runs (Slurm stops it and queues it
		// again as the same array element); Slurm delays a requeued job's
		// start, so its start time is moved to now.
		c.waitPartial(t, dir, 2)
		c.run(t, "scontrol", "requeue", job+"_2")
		c.waitState(t, job, 2, "PENDING")
		requireInterrupted(t, dir, 2)
		c.run(t, "scontrol", "update", "JobId="+job+"_2", "StartTime=now")

		again := c.submit(t, dir, append(env, fmt.Sprintf("LYACERT_SHARDS=%d", shards)), "--array=1")
		for task, st := range c.waitDone(t, job, shards) {
			if task == job+"_1" {
				continue // the cancelled one
			}
			if st != "COMPLETED" {
				t.Errorf("array task %s ended %s, want COMPLETED\n%s", task, st, readTail(filepath.Join(dir, fmt.Sprintf("sweep-%s.log", task))))
			}
		}
		if st := c.waitTask(t, again, 1); st != "COMPLETED" {
			t.Errorf("resubmitted task %s_1 ended %s, want COMPLETED", again, st)
		}
		// Both continued where they stopped instead of starting over.
		requireResumed(t, filepath.Join(dir, fmt.Sprintf("sweep-%s_1.log", again)))
		requireResumed(t, filepath.Join(dir, fmt.Sprintf("sweep-%s_2.log", job)))
		checkMerged(t, c, bin, dir, largeGrid)
	})
}

// checkMerged merges out-*.jsonl in dir and compares the result byte for
// byte with an unsharded sweep of the same grid (the README's promise for
// shards run on one kind of machine).
func checkMerged(t *testing.T, c *cluster, bin, dir, grid string) {
	t.Helper()
	var parts []string
	for i := range shards {
		parts = append(parts, fmt.Sprintf("out-%d.jsonl", i))
	}
	// merge and sweep exit 1 when some point is not certified stable, as
	// here; the files are what is compared.
	c.runIn(t, dir, []int{0, 1}, nil, bin, append([]string{"merge"}, append(parts, "-o", "merged.jsonl")...)...)
	args := append([]string{"sweep", modelFile}, strings.Fields(grid)...)
	c.runIn(t, dir, []int{0, 1}, nil, bin, append(args, "-o", "unsharded.jsonl")...)
	merged, err := os.ReadFile(filepath.Join(dir, "merged.jsonl"))
	if err != nil {
		t.Fatal(err)
	}
	want, err := os.ReadFile(filepath.Join(dir, "unsharded.jsonl"))
	if err != nil {
		t.Fatal(err)
	}
	if len(want) == 0 {
		t.Fatal("the unsharded sweep wrote nothing")
	}
	if !bytes.Equal(merged, want) {
		t.Fatalf("merged shards (%d bytes) differ from the unsharded sweep (%d bytes) at byte %d", len(merged), len(want), firstDiff(merged, want))
	}
	t.Logf("merged %d shards: %d bytes, equal to the unsharded sweep", shards, len(merged))
}

func firstDiff(a, b []byte) int {
	for i := range min(len(a), len(b)) {
		if a[i] != b[i] {
			return i
		}
	}
	return min(len(a), len(b))
}

// requireInterrupted checks that shard i was stopped mid-run: its output is
// still OUT.partial, with some grid points in it.
func requireInterrupted(t *testing.T, dir string, i int) {
	t.Helper()
	out := filepath.Join(dir, fmt.Sprintf("out-%d.jsonl", i))
	if _, err := os.Stat(out); err == nil {
		t.Fatalf("shard %d finished before it was stopped: make the grid larger", i)
	}
	st, err := os.Stat(out + ".partial")
	if err != nil || st.Size() == 0 {
		t.Fatalf("shard %d left no partial output when stopped: %v", i, err)
	}
}

var summaryRE = regexp.MustCompile(`(\d+) done \((\d+) in this run`)

// requireResumed checks the last sweep summary in a task's log: fewer grid
// points in this run than done means --resume kept the earlier ones.
func requireResumed(t *testing.T, log string) {
	t.Helper()
	data, err := os.ReadFile(log)
	if err != nil {
		t.Fatal(err)
	}
	m := summaryRE.FindAllSubmatch(data, -1)
	if len(m) == 0 {
		t.Fatalf("%s has no sweep summary:\n%s", log, readTail(log))
	}
	last := m[len(m)-1]
	done, _ := strconv.Atoi(string(last[1]))
	thisRun, _ := strconv.Atoi(string(last[2]))
	if thisRun >= done {
		t.Fatalf("%s: %d done, %d in this run: the task started over instead of resuming", log, done, thisRun)
	}
	t.Logf("%s: %d grid points done, %d of them in the continued run", filepath.Base(log), done, thisRun)
}

// cluster is a single-node Slurm started by the test.
type cluster struct {
	root string   // temporary folder: configuration, key, sockets, state, logs
	env  []string // the environment for Slurm's commands (SLURM_CONF)
}

func (c *cluster) workDir(t *testing.T, name string) string {
	t.Helper()
	dir := filepath.Join(c.root, name)
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	src, err := os.ReadFile(filepath.Join("..", "..", "testdata", "models", modelFile))
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, modelFile), src, 0o644); err != nil {
		t.Fatal(err)
	}
	return dir
}

// startCluster writes a slurm.conf for one node on 127.0.0.1 and starts
// munged, slurmctld and slurmd, all of them stopped in t.Cleanup. It skips
// the test, saying why, when that is impossible here.
func startCluster(t *testing.T) *cluster {
	t.Helper()
	if os.Geteuid() != 0 {
		t.Skip("the Slurm daemons of this test run as root; not root here")
	}
	for _, p := range []string{"munged", "munge", "slurmctld", "slurmd", "sbatch", "squeue", "sinfo", "scancel", "scontrol"} {
		if _, err := exec.LookPath(p); err != nil {
			t.Skipf("%s not found: install Debian's slurmctld slurmd slurm-client munge", p)
		}
	}
	// A short path (socket paths are limited to about 100 bytes) that every
	// user may enter, as munged requires of its socket's folders.
	root, err := os.MkdirTemp("", "lyaslurm")
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { os.RemoveAll(root) })
	if err := os.Chmod(root, 0o755); err != nil {
		t.Fatal(err)
	}
	c := &cluster{root: root}
	t.Cleanup(func() {
		if t.Failed() {
			for _, f := range []string{"munged.log", "slurmctld.log", "slurmd.log"} {
				t.Logf("%s:\n%s", f, readTail(filepath.Join(root, f)))
			}
		}
	})

	// munge: a fresh key and its own socket.
	key := make([]byte, 1024)
	rand.Read(key)
	if err := os.WriteFile(filepath.Join(root, "munge.key"), key, 0o600); err != nil {
		t.Fatal(err)
	}
	socket := filepath.Join(root, "munge.sock")
	c.daemon(t, "munged", "munged", "--foreground", "--key-file="+filepath.Join(root, "munge.key"),
		"--socket="+socket, "--pid-file="+filepath.Join(root, "munged.pid"),
		"--seed-file="+filepath.Join(root, "munged.seed"), "--log-file="+filepath.Join(root, "munged.log"))
	c.waitFor(t, "munged's socket", func() (bool, string) {
		_, err := os.Stat(socket)
		return err == nil, fmt.Sprint(err)
	})

	host, err := os.Hostname()
	if err != nil {
		t.Fatal(err)
	}
	host, _, _ = strings.Cut(host, ".")
	ctldPort, dPort := freePort(t), freePort(t)
	for dPort == ctldPort {
		dPort = freePort(t)
	}
	for _, d := range []string{"state", "spool"} {
		if err := os.Mkdir(filepath.Join(root, d), 0o755); err != nil {
			t.Fatal(err)
		}
	}
	// Plugins that need neither systemd nor cgroups nor accounting; two
	// CPUs whatever the machine has (config_overrides), so that two of
	// the three array tasks run at a time.
	conf := fmt.Sprintf(`ClusterName=lyacert-test
SlurmctldHost=%[1]s(127.0.0.1)
SlurmctldPort=%[2]d
SlurmdPort=%[3]d
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
AuthInfo=socket=%[4]s
StateSaveLocation=%[5]s/state
SlurmdSpoolDir=%[5]s/spool
SlurmctldPidFile=%[5]s/slurmctld.pid
SlurmdPidFile=%[5]s/slurmd.pid
SlurmctldLogFile=%[5]s/slurmctld.log
SlurmdLogFile=%[5]s/slurmd.log
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
JobAcctGatherType=jobacct_gather/none
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/none
SelectType=select/cons_tres
SelectTypeParameters=CR_CPU
SchedulerType=sched/backfill
MpiDefault=none
MailProg=/bin/true
ReturnToService=2
KillWait=5
MinJobAge=600
SlurmdParameters=config_overrides
NodeName=%[1]s NodeAddr=127.0.0.1 CPUs=2 State=UNKNOWN
PartitionName=test Nodes=%[1]s Default=YES MaxTime=INFINITE State=UP
`, host, ctldPort, dPort, socket, root)
	confPath := filepath.Join(root, "slurm.conf")
	if err := os.WriteFile(confPath, []byte(conf), 0o644); err != nil {
		t.Fatal(err)
	}
	c.env = append(os.Environ(), "SLURM_CONF="+confPath)

	c.daemon(t, "slurmctld", "slurmctld", "-D", "-i")
	c.daemon(t, "slurmd", "slurmd", "-D", "-N", host)
	c.waitFor(t, "the node to be idle (sinfo)", func() (bool, string) {
		out, err := c.output("sinfo", "-h", "-N", "-o", "%t")
		return err == nil && strings.TrimSpace(out) == "idle", strings.TrimSpace(out) + fmt.Sprint(" ", err)
	})
	v, _ := c.output("sbatch", "--version")
	t.Logf("single-node Slurm up: %s, node %s, ports %d/%d", strings.TrimSpace(v), host, ctldPort, dPort)
	return c
}

func freePort(t *testing.T) int {
	t.Helper()
	l, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer l.Close()
	return l.Addr().(*net.TCPAddr).Port
}

// daemon starts a daemon in the foreground, in its own process group, and
// stops that group in t.Cleanup (SIGTERM, SIGKILL after 10 s). A daemon
// that exits at once skips the test with its output.
func (c *cluster) daemon(t *testing.T, name, prog string, args ...string) {
	t.Helper()
	logPath := filepath.Join(c.root, name+".out")
	logf, err := os.Create(logPath)
	if err != nil {
		t.Fatal(err)
	}
	defer logf.Close()
	cmd := exec.Command(prog, args...)
	cmd.Env = c.env
	cmd.Dir = c.root
	cmd.Stdout, cmd.Stderr = logf, logf
	cmd.SysProcAttr = &syscall.SysProcAttr{Setpgid: true}
	if err := cmd.Start(); err != nil {
		t.Skipf("cannot start %s here: %v", name, err)
	}
	exited := make(chan error, 1)
	go func() { exited <- cmd.Wait() }()
	t.Cleanup(func() {
		pgid := cmd.Process.Pid
		syscall.Kill(-pgid, syscall.SIGTERM)
		select {
		case <-exited:
		case <-time.After(10 * time.Second):
			syscall.Kill(-pgid, syscall.SIGKILL)
			<-exited
		}
		syscall.Kill(-pgid, syscall.SIGKILL) // children left in the group
	})
	// A daemon that cannot run here (permissions, container limits) exits
	// within moments.
	select {
	case err := <-exited:
		exited <- err
		t.Skipf("%s cannot run on this machine (it exited: %v):\n%s", name, err, readTail(logPath))
	case <-time.After(time.Second):
	}
}

// waitFor polls cond until it holds; after startWait the test is skipped,
// since it is the cluster that did not come up.
func (c *cluster) waitFor(t *testing.T, what string, cond func() (bool, string)) {
	t.Helper()
	deadline := time.Now().Add(startWait)
	for {
		ok, last := cond()
		if ok {
			return
		}
		if time.Now().After(deadline) {
			t.Skipf("Slurm did not come up on this machine: no %s after %v (last: %s)\nslurmctld:\n%s\nslurmd:\n%s", what, startWait, last,
				readTail(filepath.Join(c.root, "slurmctld.log")), readTail(filepath.Join(c.root, "slurmd.log")))
		}
		time.Sleep(200 * time.Millisecond)
	}
}

// output runs a Slurm command with the cluster's environment.
func (c *cluster) output(prog string, args ...string) (string, error) {
	ctx, cancel := context.WithTimeout(context.Background(), cmdWait)
	defer cancel()
	cmd := exec.CommandContext(ctx, prog, args...)
	cmd.Env = c.env
	cmd.Dir = c.root
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		return string(out), fmt.Errorf("%s %s: %w: %s", prog, strings.Join(args, " "), err, strings.TrimSpace(stderr.String()))
	}
	return string(out), nil
}

func (c *cluster) run(t *testing.T, prog string, args ...string) string {
	t.Helper()
	out, err := c.output(prog, args...)
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// runIn runs a command in dir with extra environment and requires one of
// the exit codes.
func (c *cluster) runIn(t *testing.T, dir string, codes []int, extra []string, prog string, args ...string) string {
	t.Helper()
	ctx, cancel := context.WithTimeout(context.Background(), cmdWait)
	defer cancel()
	cmd := exec.CommandContext(ctx, prog, args...)
	cmd.Env = append(append([]string{}, c.env...), extra...)
	cmd.Dir = dir
	out, err := cmd.CombinedOutput()
	code := 0
	var ee *exec.ExitError
	if errors.As(err, &ee) {
		code = ee.ExitCode()
	} else if err != nil {
		t.Fatalf("%s %s: %v", prog, strings.Join(args, " "), err)
	}
	for _, ok := range codes {
		if code == ok {
			return string(out)
		}
	}
	t.Fatalf("%s %s: exit status %d:\n%s", prog, strings.Join(args, " "), code, out)
	return ""
}

// submit submits sweep.sh, as it is in the repository, from dir (the
// submit directory) and returns the job id.
func (c *cluster) submit(t *testing.T, dir string, env []string, array string) string {
	t.Helper()
	script, err := filepath.Abs("sweep.sh")
	if err != nil {
		t.Fatal(err)
	}
	// The script asks for 8 CPUs per task; the test node has 2.
	out := c.runIn(t, dir, []int{0}, env, "sbatch", "--parsable", array, "--cpus-per-task=1", script)
	id, _, _ := strings.Cut(strings.TrimSpace(out), ";")
	if _, err := strconv.Atoi(id); err != nil {
		t.Fatalf("sbatch printed %q, not a job id", out)
	}
	return id
}

// states returns the state of every array task of a job by task name
// (JOB_i), from squeue (there is no accounting; MinJobAge keeps finished
// jobs visible).
func (c *cluster) states(t *testing.T, job string) map[string]string {
	t.Helper()
	out := c.run(t, "squeue", "-h", "-r", "-t", "all", "-j", job, "-o", "%i %T")
	states := map[string]string{}
	for _, line := range strings.Split(strings.TrimSpace(out), "\n") {
		if f := strings.Fields(line); len(f) == 2 {
			states[f[0]] = f[1]
		}
	}
	return states
}

func finished(state string) bool {
	switch state {
	case "PENDING", "RUNNING", "CONFIGURING", "COMPLETING", "REQUEUED", "REQUEUE_HOLD", "REQUEUE_FED", "RESIZING", "SUSPENDED", "STAGE_OUT", "SIGNALING":
		return false
	}
	return true
}

// waitDone waits until the n array tasks of job have finished and returns
// their states.
func (c *cluster) waitDone(t *testing.T, job string, n int) map[string]string {
	t.Helper()
	deadline := time.Now().Add(jobWait)
	for {
		states := c.states(t, job)
		done := len(states) == n
		for _, st := range states {
			done = done && finished(st)
		}
		if done {
			return states
		}
		if time.Now().After(deadline) {
			t.Fatalf("job %s not finished after %v: %v", job, jobWait, states)
		}
		time.Sleep(250 * time.Millisecond)
	}
}

// waitTask waits until array task i of job has finished.
func (c *cluster) waitTask(t *testing.T, job string, i int) string {
	t.Helper()
	name := fmt.Sprintf("%s_%d", job, i)
	deadline := time.Now().Add(jobWait)
	for {
		st := c.states(t, job)[name]
		if st != "" && finished(st) {
			return st
		}
		if time.Now().After(deadline) {
			t.Fatalf("array task %s not finished after %v (state %q)", name, jobWait, st)
		}
		time.Sleep(100 * time.Millisecond)
	}
}

// waitState waits until array task i of job is in the given state.
func (c *cluster) waitState(t *testing.T, job string, i int, want string) {
	t.Helper()
	name := fmt.Sprintf("%s_%d", job, i)
	deadline := time.Now().Add(jobWait)
	for {
		st := c.states(t, job)[name]
		if st == want {
			return
		}
		if time.Now().After(deadline) {
			t.Fatalf("array task %s not %s after %v (state %q)", name, want, jobWait, st)
		}
		time.Sleep(100 * time.Millisecond)
	}
}

// waitPartial waits until shard i has written some grid points to its
// OUT.partial (lyacert flushes about once a second).
func (c *cluster) waitPartial(t *testing.T, dir string, i int) {
	t.Helper()
	path := filepath.Join(dir, fmt.Sprintf("out-%d.jsonl.partial", i))
	deadline := time.Now().Add(jobWait)
	for {
		if st, err := os.Stat(path); err == nil && st.Size() > 0 {
			return
		}
		if _, err := os.Stat(filepath.Join(dir, fmt.Sprintf("out-%d.jsonl", i))); err == nil {
			t.Fatalf("shard %d finished before it could be stopped: make the grid larger", i)
		}
		if time.Now().After(deadline) {
			t.Fatalf("shard %d wrote nothing within %v", i, jobWait)
		}
		time.Sleep(20 * time.Millisecond)
	}
}

// buildLyacert builds the command into dir.
func buildLyacert(t *testing.T, dir string) string {
	t.Helper()
	bin := filepath.Join(dir, "lyacert")
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Minute)
	defer cancel()
	out, err := exec.CommandContext(ctx, "go", "build", "-o", bin, "github.com/lyacert/lyacert/cmd/lyacert").CombinedOutput()
	if err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	return bin
}

// readTail returns the last lines of a file, for failure messages.
func readTail(path string) string {
	data, err := os.ReadFile(path)
	if err != nil {
		return err.Error()
	}
	lines := strings.Split(strings.TrimRight(string(data), "\n"), "\n")
	if len(lines) > 30 {
		lines = lines[len(lines)-30:]
	}
	return strings.Join(lines, "\n")
}
