package main

import (
	"errors"
	"flag"
	"io"
	"net"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
	"time"

	"gopkg.in/yaml.v3"
)

// The container definitions run real subcommands with real flags: every
// args list in docker-compose.yml and deploy/k8s names a subcommand of
// this binary, and each --flag of serve or work is one they define.
func TestDeploy_CommandsExist(t *testing.T) {
	files, _ := filepath.Glob("../../deploy/k8s/*.yaml")
	files = append(files, "../../docker-compose.yml")
	found := 0
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		var doc any
		if err := yaml.Unmarshal(b, &doc); err != nil {
			t.Fatalf("%s: %v", f, err)
		}
		for _, args := range commandLists(doc) {
			found++
			checkCommand(t, f, args)
		}
	}
	if found < 4 { // compose, migration job, API and worker deployments
		t.Fatalf("found %d commands", found)
	}
}

// commandLists finds every "args" or "command" list of strings.
func commandLists(v any) [][]string {
	var out [][]string
	switch x := v.(type) {
	case map[string]any:
		for k, val := range x {
			if list, ok := val.([]any); ok && (k == "args" || k == "command") {
				var args []string
				for _, a := range list {
					args = append(args, a.(string))
				}
				out = append(out, args)
				continue
			}
			out = append(out, commandLists(val)...)
		}
	case []any:
		for _, e := range x {
			out = append(out, commandLists(e)...)
		}
	}
	return out
}

func checkCommand(t *testing.T, file string, args []string) {
	switch args[0] {
	case "serve", "work":
		cfg := defaultConfig(func(string) string { return "" })
		fs := flag.NewFlagSet(args[0], flag.ContinueOnError)
		fs.SetOutput(io.Discard)
		cfg.bindServerFlags(fs, args[0] == "serve")
		for _, a := range args[1:] {
			if name, ok := strings.CutPrefix(a, "--"); ok && fs.Lookup(strings.SplitN(name, "=", 2)[0]) == nil {
				t.Errorf("%s: %s has no flag %s", file, args[0], a)
			}
		}
		if err := fs.Parse(args[1:]); err != nil {
			t.Errorf("%s: %v: %v", file, args, err)
		}
	case "migrate":
		if len(args) != 2 || (args[1] != "up" && args[1] != "status") {
			t.Errorf("%s: %v", file, args)
		}
	default:
		t.Errorf("%s: %q is not a subcommand", file, args[0])
	}
}

// The manifests' memory, grace and settings agree: each deployment's
// GOMEMLIMIT is under its memory limit, the worker's jobs fit in its limit
// (workers × PATHVET_JOB_MEMORY_MIB at most 90% of it), both name the same
// job memory, and the shutdown grace ends before the pod is killed.
func TestDeploy_MemoryAndGraceAgree(t *testing.T) {
	api, worker := deployment(t, "api-deployment.yaml"), deployment(t, "worker-deployment.yaml")
	for _, d := range []podSpec{api, worker} {
		if mib(t, d.env["GOMEMLIMIT"]) >= mib(t, d.limit) {
			t.Errorf("%s: GOMEMLIMIT %s is not under the limit %s", d.name, d.env["GOMEMLIMIT"], d.limit)
		}
		grace, err := time.ParseDuration(d.env["PATHVET_SHUTDOWN_GRACE"])
		if err != nil || grace >= time.Duration(d.termination)*time.Second {
			t.Errorf(
				"%s: shutdown grace %q against termination %d s",
				d.name,
				d.env["PATHVET_SHUTDOWN_GRACE"],
				d.termination,
			)
		}
	}
	job, err := strconv.Atoi(worker.env["PATHVET_JOB_MEMORY_MIB"])
	if err != nil || float64(job*worker.workers) > 0.9*float64(mib(t, worker.limit)) {
		t.Errorf(
			"worker: %d jobs × %q MiB do not fit in %s",
			worker.workers,
			worker.env["PATHVET_JOB_MEMORY_MIB"],
			worker.limit,
		)
	}
	if api.env["PATHVET_JOB_MEMORY_MIB"] != worker.env["PATHVET_JOB_MEMORY_MIB"] {
		t.Errorf(
			"the API refuses by %q MiB, the workers have %q",
			api.env["PATHVET_JOB_MEMORY_MIB"],
			worker.env["PATHVET_JOB_MEMORY_MIB"],
		)
	}
}

type podSpec struct {
	name        string
	env         map[string]string
	limit       string
	termination int
	workers     int
}

func deployment(t *testing.T, file string) podSpec {
	t.Helper()
	b, err := os.ReadFile("../../deploy/k8s/" + file)
	if err != nil {
		t.Fatal(err)
	}
	var d struct {
		Spec struct {
			Template struct {
				Spec struct {
					Termination int `yaml:"terminationGracePeriodSeconds"`
					Containers  []struct {
						Args []string
						Env  []struct{ Name, Value string }
						Res  struct{ Limits struct{ Memory string } } `yaml:"resources"`
					}
				}
			}
		}
	}
	if err := yaml.Unmarshal(b, &d); err != nil || len(d.Spec.Template.Spec.Containers) != 1 {
		t.Fatalf("%s: %v", file, err)
	}
	c := d.Spec.Template.Spec.Containers[0]
	p := podSpec{
		name:        file,
		env:         map[string]string{},
		limit:       c.Res.Limits.Memory,
		termination: d.Spec.Template.Spec.Termination,
	}
	for _, e := range c.Env {
		p.env[e.Name] = e.Value
	}
	for i, a := range c.Args {
		if a == "--workers" && i+1 < len(c.Args) {
			p.workers, _ = strconv.Atoi(c.Args[i+1])
		}
	}
	return p
}

// mib reads a quantity such as 2Gi, 512Mi or 1800MiB in MiB.
func mib(t *testing.T, q string) int {
	t.Helper()
	for suffix, f := range map[string]int{"GiB": 1024, "MiB": 1, "Gi": 1024, "Mi": 1} {
		if n, err := strconv.Atoi(strings.TrimSuffix(q, suffix)); err == nil && strings.HasSuffix(q, suffix) {
			return n * f
		}
	}
	t.Fatalf("quantity %q", q)
	return 0
}

// docker compose waits longer than the default shutdown grace.
func TestDeploy_ComposeGrace(t *testing.T) {
	var doc struct {
		Services map[string]struct {
			Grace string `yaml:"stop_grace_period"`
		}
	}
	if err := yaml.Unmarshal(readFile(t, "../../docker-compose.yml"), &doc); err != nil {
		t.Fatal(err)
	}
	grace, err := time.ParseDuration(doc.Services["pathvet"].Grace)
	if def := defaultConfig(func(string) string { return "" }).Shutdown; err != nil || grace <= def {
		t.Fatalf("stop_grace_period %q is not longer than the shutdown grace %v", doc.Services["pathvet"].Grace, def)
	}
}

// The dev server checks its address before anything else: with the port
// taken it says so and stops, before it starts a database, builds, or
// prints a key (which would be a key for nobody).
func TestDevServer_RefusesTakenAddress(t *testing.T) {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	defer ln.Close()
	cmd := exec.Command("bash", "../../deploy/dev-server.sh", "--addr", ln.Addr().String())
	cmd.Env = append(os.Environ(), "PATHVET_DATABASE_URL=postgres://nobody@127.0.0.1:1/none")
	out, err := cmd.CombinedOutput()
	var exit *exec.ExitError
	if !errors.As(err, &exit) || exit.ExitCode() != 1 || !strings.Contains(string(out), "is already in use") ||
		strings.Contains(string(out), "token") {
		t.Fatalf("%v:\n%s", err, out)
	}
}
