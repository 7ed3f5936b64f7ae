// Package deploy holds deployment examples (systemd, container, Kubernetes,
// nginx); this test checks that they are well-formed and agree with each
// other and with the configuration they carry.
package deploy

import (
	"bytes"
	"crypto/ecdsa"
	"crypto/elliptic"
	"crypto/rand"
	"crypto/x509"
	"crypto/x509/pkix"
	"encoding/pem"
	"errors"
	"fmt"
	"io"
	"math/big"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"go.yaml.in/yaml/v3"

	"heliocal/config"
	"heliocal/feed/publish"
)

type doc = map[string]any

// manifests reads every YAML document under kubernetes/.
func manifests(t *testing.T) map[string]doc { // kind/name → document
	t.Helper()
	files, err := filepath.Glob("kubernetes/*.yaml")
	if err != nil || len(files) == 0 {
		t.Fatalf("no manifests: %v", err)
	}
	out := map[string]doc{}
	for _, f := range files {
		if filepath.Base(f) == "kustomization.yaml" {
			continue // not a manifest: the list of them (see TestKustomization)
		}
		data, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		dec := yaml.NewDecoder(bytes.NewReader(data))
		for i := 0; ; i++ {
			var d doc
			err := dec.Decode(&d)
			if errors.Is(err, io.EOF) {
				break
			}
			if err != nil {
				t.Fatalf("%s document %d: %v", f, i, err)
			}
			if d == nil {
				continue
			}
			kind, _ := d["kind"].(string)
			name, _ := get(d, "metadata", "name").(string)
			if d["apiVersion"] == nil || kind == "" || name == "" {
				t.Fatalf("%s document %d: apiVersion, kind and metadata.name are required", f, i)
			}
			key := kind + "/" + name
			if _, dup := out[key]; dup {
				t.Fatalf("%s: %s defined twice", f, key)
			}
			out[key] = d
		}
	}
	return out
}

// get walks maps by key and lists by index ("0").
func get(v any, path ...string) any {
	for _, p := range path {
		switch x := v.(type) {
		case map[string]any:
			v = x[p]
		case []any:
			i, err := strconv.Atoi(p)
			if err != nil || i >= len(x) {
				return nil
			}
			v = x[i]
		default:
			return nil
		}
	}
	return v
}

func str(v any) string { return fmt.Sprint(v) }

func TestKubernetesServe(t *testing.T) {
	m := manifests(t)
	dep := m["Deployment/heliocal"]
	if dep == nil {
		t.Fatal("no Deployment/heliocal")
	}
	if r, _ := get(dep, "spec", "replicas").(int); r < 2 {
		t.Errorf("replicas %v, want 2 or more", get(dep, "spec", "replicas"))
	}
	pod := get(dep, "spec", "template", "spec")
	if get(pod, "securityContext", "runAsNonRoot") != true {
		t.Error("pod does not require a non-root user")
	}
	c := get(pod, "containers", "0")
	args := get(c, "args").([]any)
	if str(args[0]) != "serve" || !contains(args, "--config") {
		t.Errorf("container args %v: want serve --config FILE", args)
	}
	for _, probe := range []string{"startupProbe", "readinessProbe", "livenessProbe"} {
		if p := get(c, probe, "httpGet", "path"); p != "/healthz" {
			t.Errorf("%s path %v, want /healthz", probe, p)
		}
	}
	if get(c, "resources", "requests", "cpu") == nil || get(c, "resources", "limits", "memory") == nil {
		t.Error("container lacks resource requests or limits")
	}
	sc := get(c, "securityContext")
	if get(sc, "readOnlyRootFilesystem") != true || get(sc, "allowPrivilegeEscalation") != false {
		t.Errorf("container securityContext %v", sc)
	}
	checkConfigVolume(t, m, pod, c, args)
	checkImageAndMemory(t, c)

	// The Service selects the Deployment's pods and targets a named port.
	svc := m["Service/heliocal"]
	labels := get(dep, "spec", "template", "metadata", "labels").(map[string]any)
	for k, v := range get(svc, "spec", "selector").(map[string]any) {
		if labels[k] != v {
			t.Errorf("Service selector %s=%v does not match the pod labels %v", k, v, labels)
		}
	}
	target := str(get(svc, "spec", "ports", "0", "targetPort"))
	found := false
	for _, p := range get(c, "ports").([]any) {
		found = found || str(get(p, "name")) == target
	}
	if !found {
		t.Errorf("Service targetPort %q is not a container port name", target)
	}
}

func TestKubernetesPublish(t *testing.T) {
	m := manifests(t)
	cj := m["CronJob/heliocal-publish"]
	if cj == nil {
		t.Fatal("no CronJob/heliocal-publish")
	}
	job := get(cj, "spec", "jobTemplate", "spec")
	if get(job, "completionMode") != "Indexed" {
		t.Errorf("completionMode %v, want Indexed", get(job, "completionMode"))
	}
	pod := get(job, "template", "spec")
	c := get(pod, "containers", "0")
	args := get(c, "args").([]any)
	if str(args[0]) != "publish" {
		t.Errorf("args %v: want publish", args)
	}
	// The shard count is written once, as completions; the file leaves
	// parallelism and the "/SHARDS" of --shard to kustomize (see
	// TestKustomization), and without it heliocal refuses the argument.
	if n, ok := get(job, "completions").(int); !ok || n < 2 {
		t.Errorf("completions %v, want the shard count", get(job, "completions"))
	}
	if get(job, "parallelism") != nil {
		t.Errorf("parallelism %v written beside completions", get(job, "parallelism"))
	}
	if shard := str(get(c, "args", "4")); argAfter(args, "--shard") != shard || shard != "$(JOB_COMPLETION_INDEX)/SHARDS" {
		t.Fatalf("args[4] %q, --shard %q: want --shard $(JOB_COMPLETION_INDEX)/SHARDS at index 4", shard, argAfter(args, "--shard"))
	}
	if _, err := publish.ParseShard("0/SHARDS"); err == nil {
		t.Error(`--shard "0/SHARDS" (applied without kustomize) is accepted`)
	}
	checkImageAndMemory(t, c)
	// --out must be a mounted volume backed by the shared claim.
	out := argAfter(args, "--out")
	vol := mountAt(c, out)
	claim := str(get(volumeNamed(pod, vol), "persistentVolumeClaim", "claimName"))
	pvc := m["PersistentVolumeClaim/"+claim]
	if pvc == nil {
		t.Fatalf("--out %s: volume %q has no PersistentVolumeClaim in the manifests", out, vol)
	}
	if !contains(get(pvc, "spec", "accessModes").([]any), "ReadWriteMany") {
		t.Error("shards on several nodes need a ReadWriteMany volume")
	}
	if get(pod, "restartPolicy") != "Never" && get(pod, "restartPolicy") != "OnFailure" {
		t.Errorf("restartPolicy %v", get(pod, "restartPolicy"))
	}
	if get(c, "securityContext", "readOnlyRootFilesystem") != true || get(pod, "securityContext", "runAsNonRoot") != true {
		t.Error("publish container not read-only and non-root")
	}
	checkConfigVolume(t, m, pod, c, args)
}

// checkImageAndMemory: the image is pinned to a version (a moving tag
// with IfNotPresent leaves each node on whatever it pulled first), and
// GOMEMLIMIT follows the container's memory limit.
func checkImageAndMemory(t *testing.T, c any) {
	t.Helper()
	image := str(get(c, "image"))
	if !regexp.MustCompile(`:v\d+\.\d+\.\d+$|@sha256:[0-9a-f]{64}$`).MatchString(image) {
		t.Errorf("image %q is not pinned to a version", image)
	}
	found := false
	for _, e := range get(c, "env").([]any) {
		if str(get(e, "name")) == "GOMEMLIMIT" {
			found = true
			ref := get(e, "valueFrom", "resourceFieldRef")
			if str(get(ref, "resource")) != "limits.memory" || str(get(ref, "containerName")) != str(get(c, "name")) {
				t.Errorf("GOMEMLIMIT from %v, want this container's limits.memory", ref)
			}
		}
	}
	if !found || get(c, "resources", "limits", "memory") == nil {
		t.Errorf("container %v: no GOMEMLIMIT from a memory limit", get(c, "name"))
	}
}

// TestKustomization: kustomization.yaml lists every manifest, and its
// replacements copy the publish Job's completions into parallelism and into
// the part after "/" of --shard. The test applies those replacements the
// way kustomize does (copy the source value; with a delimiter, replace that
// part of the target string) and checks the result.
func TestKustomization(t *testing.T) {
	data, err := os.ReadFile("kubernetes/kustomization.yaml")
	if err != nil {
		t.Fatal(err)
	}
	var k struct {
		Resources    []string
		Replacements []struct {
			Source struct {
				Kind, Name string
				FieldPath  string `yaml:"fieldPath"`
			}
			Targets []struct {
				Select     struct{ Kind, Name string }
				FieldPaths []string `yaml:"fieldPaths"`
				Options    struct {
					Delimiter string
					Index     int
					Create    bool
				}
			}
		}
	}
	if err := yaml.Unmarshal(data, &k); err != nil {
		t.Fatal(err)
	}
	files, _ := filepath.Glob("kubernetes/*.yaml")
	for _, f := range files {
		if b := filepath.Base(f); b != "kustomization.yaml" && !slices.Contains(k.Resources, b) {
			t.Errorf("kustomization.yaml does not list %s", b)
		}
	}
	m := manifests(t)
	job := get(m["CronJob/heliocal-publish"], "spec", "jobTemplate", "spec")
	if len(k.Replacements) != 1 || k.Replacements[0].Source.Kind != "CronJob" || k.Replacements[0].Source.Name != "heliocal-publish" ||
		k.Replacements[0].Source.FieldPath != "spec.jobTemplate.spec.completions" {
		t.Fatalf("replacements %+v: want one, from the publish CronJob's completions", k.Replacements)
	}
	n := str(get(job, "completions"))
	var parallelism, shard string
	for _, tg := range k.Replacements[0].Targets {
		if tg.Select.Kind != "CronJob" || tg.Select.Name != "heliocal-publish" || len(tg.FieldPaths) != 1 {
			t.Fatalf("target %+v", tg)
		}
		switch fp := tg.FieldPaths[0]; fp {
		case "spec.jobTemplate.spec.parallelism":
			if !tg.Options.Create {
				t.Error("parallelism is not in the file: the replacement must create it")
			}
			parallelism = n
		case "spec.jobTemplate.spec.template.spec.containers.[name=publish].args.4":
			c := get(job, "template", "spec", "containers", "0")
			if str(get(c, "name")) != "publish" {
				t.Fatalf("container %v, want publish", get(c, "name"))
			}
			parts := strings.Split(str(get(c, "args", "4")), tg.Options.Delimiter)
			if tg.Options.Delimiter != "/" || tg.Options.Index != 1 || len(parts) != 2 {
				t.Fatalf("target %s: options %+v on %q", fp, tg.Options, get(c, "args", "4"))
			}
			parts[tg.Options.Index] = n
			shard = strings.Join(parts, tg.Options.Delimiter)
		default:
			t.Errorf("unexpected target %s", fp)
		}
	}
	if parallelism != n || shard != "$(JOB_COMPLETION_INDEX)/"+n {
		t.Fatalf("after the replacements: parallelism %q, --shard %q; want %s and $(JOB_COMPLETION_INDEX)/%s", parallelism, shard, n, n)
	}
	for i := 0; i < atoi(t, n); i++ {
		if sh, err := publish.ParseShard(strings.Replace(shard, "$(JOB_COMPLETION_INDEX)", strconv.Itoa(i), 1)); err != nil || sh.Count != atoi(t, n) {
			t.Errorf("shard %d: %v %+v", i, err, sh)
		}
	}
}

func atoi(t *testing.T, s string) int {
	t.Helper()
	n, err := strconv.Atoi(s)
	if err != nil {
		t.Fatal(err)
	}
	return n
}

// checkConfigVolume: --config names a file in a mounted ConfigMap, and that
// file is a valid heliocal configuration.
func checkConfigVolume(t *testing.T, m map[string]doc, pod, c any, args []any) {
	t.Helper()
	path := argAfter(args, "--config")
	dir, file := filepath.Split(path)
	vol := mountAt(c, filepath.Clean(dir))
	cmName := str(get(volumeNamed(pod, vol), "configMap", "name"))
	cm := m["ConfigMap/"+cmName]
	if cm == nil {
		t.Fatalf("--config %s: no ConfigMap behind volume %q", path, vol)
	}
	text, ok := get(cm, "data", file).(string)
	if !ok {
		t.Fatalf("ConfigMap %s has no key %q", cmName, file)
	}
	if _, err := config.Parse(strings.NewReader(text), "yaml"); err != nil {
		t.Errorf("ConfigMap %s/%s is not a valid configuration: %v", cmName, file, err)
	}
}

func argAfter(args []any, flag string) string {
	for i, a := range args {
		if str(a) == flag && i+1 < len(args) {
			return str(args[i+1])
		}
	}
	return ""
}

func contains(list []any, s string) bool {
	for _, v := range list {
		if str(v) == s {
			return true
		}
	}
	return false
}

func mountAt(c any, path string) string {
	for _, vm := range get(c, "volumeMounts").([]any) {
		if str(get(vm, "mountPath")) == path {
			return str(get(vm, "name"))
		}
	}
	return ""
}

func volumeNamed(pod any, name string) any {
	for _, v := range get(pod, "volumes").([]any) {
		if str(get(v, "name")) == name {
			return v
		}
	}
	return nil
}

// TestSystemdUnits: the units carry the hardening the README promises, and
// systemd-analyze verify accepts them when it is installed.
func TestSystemdUnits(t *testing.T) {
	want := map[string][]string{
		"heliocal.service": {"ExecStart=/usr/local/bin/heliocal serve --config ", "ExecReload=/bin/kill -HUP $MAINPID",
			"DynamicUser=yes", "ProtectSystem=strict", "ProtectHome=yes", "NoNewPrivileges=yes", "PrivateTmp=yes",
			"CapabilityBoundingSet=\n", "RestrictAddressFamilies=", "SystemCallFilter=@system-service"},
		"heliocal-publish.service": {"Type=oneshot", "ExecStart=/usr/local/bin/heliocal publish --config ",
			"--out /var/lib/heliocal/public", "ProtectSystem=strict", "NoNewPrivileges=yes", "StateDirectory=heliocal"},
		"heliocal-publish.timer": {"OnCalendar=", "Persistent=true", "WantedBy=timers.target"},
	}
	for name, lines := range want {
		data, err := os.ReadFile(filepath.Join("systemd", name))
		if err != nil {
			t.Fatal(err)
		}
		for _, l := range lines {
			if !bytes.Contains(data, []byte(l)) {
				t.Errorf("%s lacks %q", name, l)
			}
		}
	}
	// The comments and the ordering say what the units do: a unit without
	// network (PrivateNetwork=yes) is not ordered after network-online, and
	// only a unit with a StateDirectory= speaks of its state directory.
	for name := range want {
		data, err := os.ReadFile(filepath.Join("systemd", name))
		if err != nil {
			t.Fatal(err)
		}
		text := string(data)
		if strings.Contains(text, "PrivateNetwork=yes") && strings.Contains(text, "network-online.target") {
			t.Errorf("%s has no network (PrivateNetwork=yes) but is ordered after network-online.target", name)
		}
		hasState := regexp.MustCompile(`(?m)^StateDirectory=`).MatchString(text)
		for _, line := range strings.Split(text, "\n") {
			if strings.HasPrefix(line, "#") && strings.Contains(line, "state directory") && !strings.Contains(line, "no state directory") && !hasState {
				t.Errorf("%s: comment %q speaks of a state directory the unit does not have", name, line)
			}
		}
	}
	analyze, err := exec.LookPath("systemd-analyze")
	if err != nil {
		t.Skip("systemd-analyze not installed")
	}
	// verify wants the executable to exist: point it at this test binary.
	self, err := os.Executable()
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	var paths []string
	for name := range want {
		data, _ := os.ReadFile(filepath.Join("systemd", name))
		data = bytes.ReplaceAll(data, []byte("/usr/local/bin/heliocal"), []byte(self))
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, data, 0o644); err != nil {
			t.Fatal(err)
		}
		paths = append(paths, p)
	}
	out, err := exec.Command(analyze, append([]string{"verify"}, paths...)...).CombinedOutput()
	if err != nil || len(bytes.TrimSpace(out)) > 0 {
		t.Errorf("systemd-analyze verify: %v\n%s", err, out)
	}
}

func TestDockerfile(t *testing.T) {
	data, err := os.ReadFile("container/Dockerfile")
	if err != nil {
		t.Fatal(err)
	}
	s := string(data)
	for _, want := range []string{"FROM golang:1.26 AS build", "CGO_ENABLED=0", "-trimpath", "./cmd/heliocal",
		"COPY --from=build", "EXPOSE 8080", `ENTRYPOINT ["/heliocal"]`, `CMD ["serve"]`} {
		if !strings.Contains(s, want) {
			t.Errorf("Dockerfile lacks %q", want)
		}
	}
	// The example that publishes into a host folder runs as the host user
	// (the image's nonroot uid cannot write there) into a folder made first.
	for _, want := range []string{`mkdir -p public`, `docker run --rm --user "$(id -u):$(id -g)" -v "$PWD/public:/srv/public" heliocal publish --out /srv/public`,
		"ARG VERSION=\n", "-X main.version=${VERSION}"} {
		if !strings.Contains(s, want) {
			t.Errorf("Dockerfile lacks %q", want)
		}
	}
	user := regexp.MustCompile(`(?m)^USER (\S+)`).FindStringSubmatch(s)
	if user == nil || strings.HasPrefix(user[1], "root") || strings.HasPrefix(user[1], "0") {
		t.Errorf("final stage runs as %v, want a non-root USER", user)
	}
	// The image has no zoneinfo files: the binary must embed the tz database.
	main, err := os.ReadFile("../cmd/heliocal/main.go")
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(main, []byte(`_ "time/tzdata"`)) {
		t.Error("cmd/heliocal does not import time/tzdata; the distroless image has no zone files")
	}
}

// TestNginx: both example sites (static files, and a reverse proxy for
// serve) use the "http2 on;" directive, not the deprecated listen
// parameter; the proxy passes the client's host, scheme and address, keeps
// /healthz out of any cache and leaves compression to heliocal; and nginx -t
// accepts each inside a minimal main configuration when nginx is installed
// (certificate paths pointed at a throw-away self-signed pair, everything
// else as shipped). nginx older than 1.25.1 does not know "http2 on;": for
// it the test writes the listen parameter instead, as the comment in the
// files tells.
func TestNginx(t *testing.T) {
	proxy, err := os.ReadFile("nginx/heliocal-serve.conf")
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"proxy_pass http://heliocal_serve;", "proxy_set_header Host $host;",
		"proxy_set_header X-Forwarded-For $proxy_add_x_forwarded_for;", "proxy_set_header X-Forwarded-Proto $scheme;",
		"gzip off;", "server 127.0.0.1:8080;"} {
		if !bytes.Contains(proxy, []byte(want)) {
			t.Errorf("heliocal-serve.conf lacks %q", want)
		}
	}
	health := regexp.MustCompile(`(?s)location = /healthz \{(.*?)\}`).FindSubmatch(proxy)
	if health == nil || !bytes.Contains(health[1], []byte("proxy_no_cache 1;")) || !bytes.Contains(health[1], []byte(`"no-store"`)) {
		t.Errorf("/healthz may be cached: %q", health)
	}
	// A header heliocal sends (its Cache-Control on /healthz, feeds and
	// ad-hoc feeds) that a location adds too would reach the client twice:
	// a location that adds one hides heliocal's.
	addHeader := regexp.MustCompile(`(?m)^\s*add_header\s+(\S+)`)
	for _, loc := range regexp.MustCompile(`(?s)location ([^{]*)\{(.*?)\}`).FindAllSubmatch(proxy, -1) {
		if !bytes.Contains(loc[2], []byte("proxy_pass ")) {
			continue // nginx's own answer: no header of heliocal's
		}
		for _, add := range addHeader.FindAllSubmatch(loc[2], -1) {
			if !bytes.Contains(loc[2], []byte("proxy_hide_header "+string(add[1])+";")) {
				t.Errorf("heliocal-serve.conf: location %s: add_header %s without proxy_hide_header %[2]s: the header is sent twice", bytes.TrimSpace(loc[1]), add[1])
			}
		}
	}
	unit, err := os.ReadFile("systemd/heliocal.service")
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Contains(unit, []byte("--listen 127.0.0.1:8080")) {
		t.Error("heliocal.service does not listen where heliocal-serve.conf sends requests")
	}
	static, err := os.ReadFile("nginx/heliocal.conf")
	if err != nil {
		t.Fatal(err)
	}
	// A 404 is not cached for the hour a feed is: a feed published later
	// is found at once.
	if caching := regexp.MustCompile(`(?m)^\s*add_header Cache-Control "public[^"]*".*$`).FindAll(static, -1); len(caching) == 0 {
		t.Error("heliocal.conf sets no Cache-Control")
	} else {
		for _, line := range caching {
			if bytes.Contains(line, []byte(" always")) {
				t.Errorf("heliocal.conf: %s: \"always\" caches the 404 of a feed not yet published", bytes.TrimSpace(line))
			}
		}
	}
	for _, name := range []string{"heliocal.conf", "heliocal-serve.conf"} {
		site, err := os.ReadFile(filepath.Join("nginx", name))
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Contains(site, []byte("\n    http2 on;\n")) || regexp.MustCompile(`(?m)^\s*listen [^;]*http2`).Match(site) {
			t.Errorf("%s: want \"http2 on;\", not the listen parameter", name)
		}
	}

	nginx, err := exec.LookPath("nginx")
	if err != nil {
		t.Skip("nginx not installed")
	}
	mime := "/etc/nginx/mime.types"
	if _, err := os.Stat(mime); err != nil {
		t.Skip("no /etc/nginx/mime.types")
	}
	ver, _ := exec.Command(nginx, "-v").CombinedOutput()
	oldNginx := nginxBefore(string(ver), 1, 25, 1)
	for _, name := range []string{"heliocal.conf", "heliocal-serve.conf"} {
		t.Run(name, func(t *testing.T) {
			dir := t.TempDir()
			cert, key := selfSigned(t, dir)
			site, err := os.ReadFile(filepath.Join("nginx", name))
			if err != nil {
				t.Fatal(err)
			}
			site = bytes.ReplaceAll(site, []byte("/etc/ssl/certs/sky.example.org.pem"), []byte(cert))
			site = bytes.ReplaceAll(site, []byte("/etc/ssl/private/sky.example.org.key"), []byte(key))
			if oldNginx {
				t.Logf("%s: writing the listen parameter for \"http2 on;\"", strings.TrimSpace(string(ver)))
				site = bytes.ReplaceAll(site, []byte("\n    http2 on;\n"), []byte("\n"))
				site = bytes.ReplaceAll(site, []byte("443 ssl;"), []byte("443 ssl http2;"))
			}
			sitePath := filepath.Join(dir, "site.conf")
			if err := os.WriteFile(sitePath, site, 0o644); err != nil {
				t.Fatal(err)
			}
			main := fmt.Sprintf(`pid %[1]s/nginx.pid;
error_log %[1]s/error.log;
events {}
http {
    include %[2]s;
    access_log off;
    client_body_temp_path %[1]s;
    proxy_temp_path %[1]s;
    fastcgi_temp_path %[1]s;
    uwsgi_temp_path %[1]s;
    scgi_temp_path %[1]s;
    include %[3]s;
}
`, dir, mime, sitePath)
			mainPath := filepath.Join(dir, "nginx.conf")
			if err := os.WriteFile(mainPath, []byte(main), 0o644); err != nil {
				t.Fatal(err)
			}
			out, err := exec.Command(nginx, "-t", "-q", "-p", dir, "-c", mainPath).CombinedOutput()
			if err != nil {
				t.Errorf("nginx -t: %v\n%s", err, out)
			}
			if bytes.Contains(out, []byte("[warn]")) && !(oldNginx && bytes.Contains(out, []byte("http2"))) {
				t.Errorf("nginx -t warns:\n%s", out)
			}
		})
	}
}

// nginxBefore reports whether "nginx version: nginx/1.22.1" is older than
// major.minor.patch.
func nginxBefore(v string, major, minor, patch int) bool {
	m := regexp.MustCompile(`nginx/(\d+)\.(\d+)\.(\d+)`).FindStringSubmatch(v)
	if m == nil {
		return false
	}
	var got [3]int
	for i := range got {
		got[i], _ = strconv.Atoi(m[i+1])
	}
	want := [3]int{major, minor, patch}
	for i := range got {
		if got[i] != want[i] {
			return got[i] < want[i]
		}
	}
	return false
}

// selfSigned writes a throw-away certificate and key for nginx -t.
func selfSigned(t *testing.T, dir string) (certPath, keyPath string) {
	t.Helper()
	priv, err := ecdsa.GenerateKey(elliptic.P256(), rand.Reader)
	if err != nil {
		t.Fatal(err)
	}
	tmpl := &x509.Certificate{
		SerialNumber: big.NewInt(1),
		Subject:      pkix.Name{CommonName: "sky.example.org"},
		DNSNames:     []string{"sky.example.org"},
		NotBefore:    time.Now().Add(-time.Hour),
		NotAfter:     time.Now().Add(time.Hour),
	}
	der, err := x509.CreateCertificate(rand.Reader, tmpl, tmpl, &priv.PublicKey, priv)
	if err != nil {
		t.Fatal(err)
	}
	keyDER, err := x509.MarshalECPrivateKey(priv)
	if err != nil {
		t.Fatal(err)
	}
	certPath, keyPath = filepath.Join(dir, "cert.pem"), filepath.Join(dir, "key.pem")
	if err := os.WriteFile(certPath, pem.EncodeToMemory(&pem.Block{Type: "CERTIFICATE", Bytes: der}), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(keyPath, pem.EncodeToMemory(&pem.Block{Type: "EC PRIVATE KEY", Bytes: keyDER}), 0o600); err != nil {
		t.Fatal(err)
	}
	return certPath, keyPath
}
