package kubernetes

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"os/exec"
	"path"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	batchv1 "k8s.io/api/batch/v1"
	corev1 "k8s.io/api/core/v1"
	"k8s.io/apimachinery/pkg/util/validation"
	"sigs.k8s.io/yaml"
)

const (
	manifest = "sweep-job.yaml"
	script   = "../slurm/sweep.sh"
)

// readJob decodes the manifest strictly into the real batch/v1 Job type of
// the Kubernetes API: an unknown or misspelt field, a duplicate key or a
// value of the wrong type is an error.
func readJob(t *testing.T) *batchv1.Job {
	t.Helper()
	data, err := os.ReadFile(manifest)
	if err != nil {
		t.Fatal(err)
	}
	var job batchv1.Job
	if err := yaml.UnmarshalStrict(data, &job); err != nil {
		t.Fatalf("%s is not a batch/v1 Job: %v", manifest, err)
	}
	return &job
}

// The strict decoding itself must catch a misspelt field.
func TestStrictDecodingRejectsUnknownFields(t *testing.T) {
	for _, doc := range []string{
		"apiVersion: batch/v1\nkind: Job\nspec: {completionsMode: Indexed}\n",
		"apiVersion: batch/v1\nkind: Job\nspec: {completions: sixteen}\n",
		"apiVersion: batch/v1\nkind: Job\nspec: {completions: 1, completions: 2}\n",
	} {
		var job batchv1.Job
		if err := yaml.UnmarshalStrict([]byte(doc), &job); err == nil {
			t.Errorf("accepted:\n%s", doc)
		}
	}
}

func TestJobManifest(t *testing.T) {
	job := readJob(t)
	spec := job.Spec
	pod := spec.Template.Spec
	// The fields the Job API requires of a Job (kubernetes.io batch/v1
	// Job reference: restartPolicy Never or OnFailure; names are DNS-1123).
	if job.APIVersion != "batch/v1" || job.Kind != "Job" {
		t.Errorf("apiVersion %q kind %q, want batch/v1 Job", job.APIVersion, job.Kind)
	}
	if errs := validation.IsDNS1123Subdomain(job.Name); len(errs) > 0 {
		t.Errorf("metadata.name %q: %v", job.Name, errs)
	}
	if pod.RestartPolicy != corev1.RestartPolicyOnFailure && pod.RestartPolicy != corev1.RestartPolicyNever {
		t.Errorf("restartPolicy %q: a Job needs Never or OnFailure", pod.RestartPolicy)
	}

	// Indexed, with one completion per shard, all at once.
	if spec.CompletionMode == nil || *spec.CompletionMode != batchv1.IndexedCompletion {
		t.Fatalf("completionMode %s, want Indexed (JOB_COMPLETION_INDEX is the shard)", show(spec.CompletionMode))
	}
	if len(pod.Containers) != 1 {
		t.Fatalf("%d containers, want 1", len(pod.Containers))
	}
	c := pod.Containers[0]
	if errs := validation.IsDNS1123Label(c.Name); len(errs) > 0 {
		t.Errorf("container name %q: %v", c.Name, errs)
	}
	if c.Image == "" {
		t.Error("no image")
	}
	env := map[string]corev1.EnvVar{}
	for _, e := range c.Env {
		env[e.Name] = e
	}
	shards, err := strconv.Atoi(env["LYACERT_SHARDS"].Value)
	if err != nil {
		t.Fatalf("LYACERT_SHARDS %q: %v", env["LYACERT_SHARDS"].Value, err)
	}
	if spec.Completions == nil || int(*spec.Completions) != shards {
		t.Errorf("completions %s, want LYACERT_SHARDS = %d", show(spec.Completions), shards)
	}
	if spec.Parallelism == nil || int(*spec.Parallelism) != shards {
		t.Errorf("parallelism %s, want LYACERT_SHARDS = %d", show(spec.Parallelism), shards)
	}

	// The command runs sweep.sh from a ConfigMap volume, in the shared
	// data volume (the script's paths are relative to it).
	if len(c.Command) != 2 || c.Command[0] != "bash" || path.Base(c.Command[1]) != "sweep.sh" {
		t.Fatalf("command %q, want bash …/sweep.sh", c.Command)
	}
	volumes := map[string]corev1.Volume{}
	for _, v := range pod.Volumes {
		volumes[v.Name] = v
	}
	mounted := func(dir string) (corev1.Volume, bool) {
		for _, m := range c.VolumeMounts {
			if path.Clean(m.MountPath) == path.Clean(dir) {
				v, ok := volumes[m.Name]
				return v, ok
			}
		}
		return corev1.Volume{}, false
	}
	if v, ok := mounted(path.Dir(c.Command[1])); !ok || v.ConfigMap == nil {
		t.Errorf("%s is not on a ConfigMap volume", c.Command[1])
	} else if items := v.ConfigMap.Items; len(items) > 0 {
		t.Errorf("the ConfigMap volume selects items %v; the key must be sweep.sh, projected as is", items)
	}
	if v, ok := mounted(c.WorkingDir); !ok || v.PersistentVolumeClaim == nil {
		t.Errorf("workingDir %q is not the shared PersistentVolumeClaim volume", c.WorkingDir)
	}

	// Workers: the CPUs requested, as --cpus-per-task is in Slurm.
	ref := env["LYACERT_JOBS"].ValueFrom
	if ref == nil || ref.ResourceFieldRef == nil || ref.ResourceFieldRef.Resource != "requests.cpu" {
		t.Errorf("LYACERT_JOBS should come from requests.cpu, is %+v", env["LYACERT_JOBS"])
	} else if _, ok := c.Resources.Requests[corev1.ResourceCPU]; !ok {
		t.Error("LYACERT_JOBS refers to requests.cpu, but no CPU is requested")
	}

	// The grid is the script's default, so that a change of the grid
	// syntax cannot miss one of the two.
	if got, want := env["LYACERT_GRID"].Value, scriptGrid(t); got != want {
		t.Errorf("LYACERT_GRID %q, the script's default is %q", got, want)
	}
}

// show prints an optional field of the API types.
func show[T any](p *T) string {
	if p == nil {
		return "unset"
	}
	return fmt.Sprint(*p)
}

var gridRE = regexp.MustCompile(`\$\{LYACERT_GRID:-([^}]*)\}`)

func scriptGrid(t *testing.T) string {
	t.Helper()
	data, err := os.ReadFile(script)
	if err != nil {
		t.Fatal(err)
	}
	m := gridRE.FindAllSubmatch(data, -1)
	if len(m) != 1 {
		t.Fatalf("%s: want one ${LYACERT_GRID:-…}, found %d", script, len(m))
	}
	return string(m[0][1])
}

// TestPodsCoverTheGrid runs the script once per completion index with the
// environment the manifest gives each pod (with a small grid and a model of
// our own), then merges: the result must equal an unsharded sweep byte for
// byte. No cluster is involved: this checks the manifest's environment and
// the script, not Kubernetes.
func TestPodsCoverTheGrid(t *testing.T) {
	if _, err := exec.LookPath("bash"); err != nil {
		t.Skip("bash not found")
	}
	job := readJob(t)
	c := job.Spec.Template.Spec.Containers[0]
	dir := t.TempDir()
	bin := filepath.Join(dir, "lyacert")
	if out, err := exec.Command("go", "build", "-C", "../..", "-o", bin, "./cmd/lyacert").CombinedOutput(); err != nil {
		t.Fatalf("go build: %v\n%s", err, out)
	}
	// Lorenz with the classical sigma and b (Lorenz 1963); r over a range
	// with stable and unstable equilibria (Strogatz, §9.2).
	src, err := os.ReadFile("../../testdata/models/lorenz-classic.lya")
	if err != nil {
		t.Fatal(err)
	}
	grid := []string{"--grid", "r=1/2..30", "--points", "41"}
	var base []string
	for _, kv := range os.Environ() {
		if !strings.HasPrefix(kv, "SLURM_") && !strings.HasPrefix(kv, "LYACERT") && !strings.HasPrefix(kv, "JOB_COMPLETION_INDEX=") {
			base = append(base, kv)
		}
	}
	var model string
	for _, e := range c.Env {
		switch {
		case e.Name == "LYACERT_MODEL":
			model = e.Value
			base = append(base, e.Name+"="+e.Value)
		case e.Name == "LYACERT_GRID":
			base = append(base, e.Name+"="+strings.Join(grid, " "))
		case e.ValueFrom != nil && e.ValueFrom.ResourceFieldRef != nil:
			// What the downward API gives: the request rounded up to whole
			// CPUs (divisor 1).
			q := c.Resources.Requests[corev1.ResourceName(strings.TrimPrefix(e.ValueFrom.ResourceFieldRef.Resource, "requests."))]
			base = append(base, fmt.Sprintf("%s=%d", e.Name, (q.MilliValue()+999)/1000))
		default:
			base = append(base, e.Name+"="+e.Value)
		}
	}
	base = append(base, "LYACERT="+bin)
	if err := os.WriteFile(filepath.Join(dir, model), src, 0o644); err != nil {
		t.Fatal(err)
	}
	script, err := filepath.Abs(script)
	if err != nil {
		t.Fatal(err)
	}
	n := int(*job.Spec.Completions)
	var parts []string
	for i := range n {
		cmd := exec.Command("bash", script)
		cmd.Dir = dir
		cmd.Env = append(append([]string{}, base...), fmt.Sprintf("JOB_COMPLETION_INDEX=%d", i))
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("pod %d: %v\n%s", i, err, out)
		}
		parts = append(parts, fmt.Sprintf("out-%d.jsonl", i))
	}
	run := func(args ...string) {
		cmd := exec.Command(bin, args...)
		cmd.Dir = dir
		out, err := cmd.CombinedOutput()
		// Exit 1: some point is not certified stable, as here.
		if ee := (*exec.ExitError)(nil); err != nil && (!errors.As(err, &ee) || ee.ExitCode() != 1) {
			t.Fatalf("lyacert %s: %v\n%s", strings.Join(args, " "), err, out)
		}
	}
	run(append([]string{"merge", "-o", "merged.jsonl"}, parts...)...)
	run(append(append([]string{"sweep", model}, grid...), "-o", "unsharded.jsonl")...)
	merged, err := os.ReadFile(filepath.Join(dir, "merged.jsonl"))
	if err != nil {
		t.Fatal(err)
	}
	want, err := os.ReadFile(filepath.Join(dir, "unsharded.jsonl"))
	if err != nil {
		t.Fatal(err)
	}
	if len(want) == 0 || !bytes.Equal(merged, want) {
		t.Fatalf("merged output of %d pods (%d bytes) differs from the unsharded sweep (%d bytes)", n, len(merged), len(want))
	}
}
