#!/usr/bin/env bash
# Whole-process benchmarks of skysheet on invented libraries of N materials,
# side by side with the lab's way without the tool (bench/labscript.py).
# See bench/README.md. Prints a Markdown table on stdout; progress and every
# single run's numbers go to stderr.
set -euo pipefail

# The render command: verb and output-folder flag, split on the first space.
# Override to measure a build that still has the old names, e.g.
#   SKYSHEET_RENDER="build -o" SKYSHEET_SRC=/path/to/older/checkout bench/run.sh
SKYSHEET_RENDER=${SKYSHEET_RENDER:-"render --site"}

usage() {
	cat <<'EOF'
usage: bench/run.sh [-m MODE] [-r REPS] [-w WORKDIR] [-k] [N ...]

Generates an invented library of N materials (default: 100 1000) once per N,
then times REPS runs (default 5) and prints the medians as a Markdown table.

modes (-m):
  full      skysheet's full render and the lab script, alternately (default)
  skysheet  the full render only (for sizes where the script takes too long)
  lab       the lab script only
  changed   re-render times: full render, re-render with nothing changed (one
            file touched), re-render after one material's spectrum changed
  index     one full render, then the index opened from disk in headless
            Chromium REPS times (bench/pageload): its size with what it
            loads, the median and slowest load, the rows script, the first sort

  -w DIR    work folder (default: a new folder under /tmp, removed at the end)
  -k        keep the work folder (libraries, sites, PNGs)

environment:
  SKYSHEET_RENDER  verb and output flag (default "render --site"; "build -o" for older builds)
  SKYSHEET_SRC     source tree to build skysheet from (default: this repository)
  SKYSHEET_REV     build this git revision of SKYSHEET_SRC instead of its working tree
  SKYSHEET_BIN     a skysheet binary to time instead of building one
  PYTHON           interpreter with numpy and matplotlib (default /usr/bin/python3)
  LAB_JOBS         worker processes of the lab script (default 1)
  SEED             seed of the generated libraries (default 1)
  CHROMIUM         the browser of -m index (default /usr/bin/chromium)
EOF
}

mode=full reps=5 work="" keep=0
while getopts "m:r:w:kh" opt; do
	case $opt in
	m) mode=$OPTARG ;;
	r) reps=$OPTARG ;;
	w) work=$OPTARG ;;
	k) keep=1 ;;
	h) usage; exit 0 ;;
	*) usage >&2; exit 2 ;;
	esac
done
shift $((OPTIND - 1))
case $mode in full | skysheet | lab | changed | index) ;; *) echo "run.sh: unknown mode $mode" >&2; usage >&2; exit 2 ;; esac
[[ $reps =~ ^[1-9][0-9]*$ ]] || { echo "run.sh: -r wants a positive count" >&2; exit 2; }
sizes=("$@")
[ ${#sizes[@]} -gt 0 ] || sizes=(100 1000)
for n in "${sizes[@]}"; do
	[[ $n =~ ^[1-9][0-9]*$ ]] || { echo "run.sh: $n is not a number of materials" >&2; exit 2; }
done

here=$(cd "$(dirname "$0")" && pwd)
root=$(dirname "$here")
src=${SKYSHEET_SRC:-$root}
python=${PYTHON:-/usr/bin/python3}
lab_jobs=${LAB_JOBS:-1}
seed=${SEED:-1}
read -r verb outflag <<<"$SKYSHEET_RENDER"

[ -x /usr/bin/time ] || { echo "run.sh: needs GNU time at /usr/bin/time (apt-get install time)" >&2; exit 1; }
if [ "$mode" = full ] || [ "$mode" = lab ]; then
	"$python" -c 'import numpy, matplotlib' 2>/dev/null ||
		{ echo "run.sh: $python cannot import numpy and matplotlib (apt-get install python3-numpy python3-matplotlib)" >&2; exit 1; }
fi

if [ -z "$work" ]; then
	work=$(mktemp -d /tmp/skysheet-bench.XXXXXX)
	[ "$keep" = 1 ] || trap 'rm -rf "$work"' EXIT
fi
mkdir -p "$work"
log() { echo "run.sh: $*" >&2; }

# Build once; time the binaries, not "go run".
if [ -n "${SKYSHEET_BIN:-}" ]; then
	bin=$SKYSHEET_BIN
	rev="a given binary"
elif [ -n "${SKYSHEET_REV:-}" ]; then
	rev=$(git -C "$src" rev-parse --short "$SKYSHEET_REV^{commit}")
	log "building skysheet $rev of $src"
	rm -rf "$work/src"
	mkdir -p "$work/src"
	git -C "$src" archive "$rev" | tar -x -C "$work/src"
	(cd "$work/src" && go build -o "$work/skysheet" ./cmd/skysheet)
	bin=$work/skysheet
	rev="built from $rev"
else
	rev="built from $(git -C "$src" describe --always --dirty 2>/dev/null || echo "$src")"
	log "building skysheet from $src"
	(cd "$src" && go build -o "$work/skysheet" ./cmd/skysheet)
	bin=$work/skysheet
fi
(cd "$root" && go build -o "$work/genlib" ./bench/genlib)
if [ "$mode" = index ]; then
	chromium=${CHROMIUM:-/usr/bin/chromium}
	[ -x "$chromium" ] || { echo "run.sh: -m index needs chromium at $chromium (apt-get install chromium)" >&2; exit 1; }
	(cd "$root" && go build -o "$work/pageload" ./bench/pageload)
fi

# timed CMD...: runs CMD and prints "wall_s cpu_s rss_mib" (CPU = user +
# system, RSS = peak resident set of the process and its children).
timed() {
	local t0 t1
	t0=$(date +%s%N)
	if ! /usr/bin/time -f "%U %S %M" -o "$work/time.txt" "$@" >"$work/out.txt" 2>"$work/err.txt"; then
		log "failed: $*"
		cat "$work/out.txt" "$work/err.txt" >&2
		exit 1
	fi
	t1=$(date +%s%N)
	tail -n 1 "$work/time.txt" | awk -v ns=$((t1 - t0)) '{ printf "%.3f %.2f %.0f\n", ns / 1e9, $1 + $2, $3 / 1024 }'
}

# median: the median of the numbers on stdin, one a line.
median() {
	sort -g | awk '{ v[NR] = $1 } END { if (NR % 2) print v[(NR + 1) / 2]; else printf "%.3f\n", (v[NR / 2] + v[NR / 2 + 1]) / 2 }'
}

# med K FORMAT FILE: the median of column K of FILE, printed with FORMAT.
med() { awk -v k="$1" '{ print $k }' "$3" | median | awk -v f="$2" '{ printf f, $1 }'; }

# cell FILE: median wall time and, in brackets, median CPU time of FILE.
cell() { echo "$(med 1 %.2f "$1") ($(med 2 %.1f "$1"))"; }

# set_aside PATH...: moves each existing PATH into $work/trash, which is
# emptied when the benchmark ends. Deleting thousands of files just before
# a timed run can slow that run's file creation by seconds on some file
# systems (see bench/README.md, "The file system's share"): no run pays for
# the one before it.
set_aside() {
	local p
	mkdir -p "$work/trash"
	for p in "$@"; do
		[ -e "$p" ] || [ -L "$p" ] || continue
		mv "$p" "$(mktemp -d "$work/trash/XXXXXX")/"
	done
}

# fresh_library DIR: sets aside what a render may have left in the library
# folder (a cache, a default site folder): the generator writes only
# skysheet.yaml and content/ there.
fresh_library() {
	local p
	for p in "$1"/* "$1"/.[!.]* "$1"/..?*; do
		case ${p##*/} in skysheet.yaml | content) ;; *) set_aside "$p" ;; esac
	done
}

# change_spectrum FILE K: changes the R value at 1000 nm, differently for each K.
change_spectrum() {
	awk -F, -v OFS=, -v k="$2" '$1 == "1000" { d = 0.0001 * k; $2 = sprintf("%.4f", ($2 > 0.5) ? $2 - d : $2 + d) } 1' "$1" >"$1.tmp"
	mv "$1.tmp" "$1"
}

cores=$(nproc)
cpu=$(awk -F': ' '/^model name/ { print $2; exit }' /proc/cpuinfo 2>/dev/null || true)
mem=$(awk '/^MemTotal/ { printf "%.0f GiB", $2 / 1048576 }' /proc/meminfo 2>/dev/null || true)
load_start=$(cut -d' ' -f1-3 /proc/loadavg)
version=$("$bin" version 2>/dev/null || echo "skysheet (version unknown)")

rows=()
for n in "${sizes[@]}"; do
	lib=$work/lib-$n
	if [ ! -f "$lib/skysheet.yaml" ]; then
		log "generating $n materials in $lib"
		"$work/genlib" -n "$n" -seed "$seed" -o "$lib" >&2
	fi
	site=$work/site-$n
	lab=$work/lab-$n
	: >"$work/sky-$n.txt"
	: >"$work/lab-$n.txt"
	case $mode in
	full | skysheet | lab)
		for ((k = 1; k <= reps; k++)); do
			if [ "$mode" != lab ]; then
				set_aside "$site"
				fresh_library "$lib"
				r=$(timed "$bin" "$verb" "$lib" "$outflag" "$site")
				echo "$r" >>"$work/sky-$n.txt"
				log "N=$n run $k: skysheet $SKYSHEET_RENDER: wall ${r%% *} s (wall, CPU s, RSS MiB: $r)"
			fi
			if [ "$mode" != skysheet ]; then
				set_aside "$lab"
				r=$(timed "$python" "$here/labscript.py" "$lib" -o "$lab" --jobs "$lab_jobs")
				echo "$r" >>"$work/lab-$n.txt"
				log "N=$n run $k: lab script: wall ${r%% *} s (wall, CPU s, RSS MiB: $r)"
			fi
		done
		if [ "$mode" = full ]; then
			log "N=$n: do the lab script's figures agree with skysheet's?"
			"$python" "$here/agree.py" "$lab/figures.csv" "$site" >&2 || log "N=$n: they differ by more than 1e-3 (see above)"
		fi
		sw=- sc=- sr=- lw=- lc=- lr=- ratio=-
		if [ "$mode" != lab ]; then
			sw=$(med 1 %.2f "$work/sky-$n.txt") sc=$(med 2 %.1f "$work/sky-$n.txt") sr=$(med 3 %.0f "$work/sky-$n.txt")
		fi
		if [ "$mode" != skysheet ]; then
			lw=$(med 1 %.2f "$work/lab-$n.txt") lc=$(med 2 %.1f "$work/lab-$n.txt") lr=$(med 3 %.0f "$work/lab-$n.txt")
		fi
		if [ "$mode" = full ]; then
			ratio=$(awk -v a="$lw" -v b="$sw" 'BEGIN { printf "%.1f×", a / b }')
		fi
		rows+=("| $(printf "%'d" "$n") | $sw | $lw | $ratio | $sc | $lc | $sr | $lr |")
		;;
	index)
		set_aside "$site"
		fresh_library "$lib"
		r=$(timed "$bin" "$verb" "$lib" "$outflag" "$site")
		log "N=$n: full render: $r"
		read -r ib fb lm lx rb sm runs < <("$work/pageload" -runs "$reps" -chromium "$chromium" "$site")
		kb() { awk -v b="$1" 'BEGIN { printf "%.0f", b / 1000 }'; }
		rows+=("| $(printf "%'d" "$n") | ${r%% *} | $(kb "$ib") | $(kb "$fb") | $lm | $lx | $(kb "$rb") | $sm |")
		;;
	changed)
		# Full renders from scratch (no site, no cache).
		for ((k = 1; k <= reps; k++)); do
			set_aside "$site"
			fresh_library "$lib"
			r=$(timed "$bin" "$verb" "$lib" "$outflag" "$site")
			echo "$r" >>"$work/sky-$n.txt"
			log "N=$n run $k: full render: $r"
		done
		# The site and cache of the last full render stay for the re-renders.
		spectrum=$(find "$lib/content" -name uvvis.csv | sort | sed -n "$(((n + 1) / 2))p")
		cp "$spectrum" "$work/spectrum.orig"
		: >"$work/same-$n.txt"
		: >"$work/changed-$n.txt"
		for ((k = 1; k <= reps; k++)); do
			touch "$spectrum"
			r=$(timed "$bin" "$verb" "$lib" "$outflag" "$site")
			echo "$r" >>"$work/same-$n.txt"
			log "N=$n run $k: re-render, nothing changed (one file touched): $r"
			change_spectrum "$spectrum" "$k"
			r=$(timed "$bin" "$verb" "$lib" "$outflag" "$site")
			echo "$r" >>"$work/changed-$n.txt"
			log "N=$n run $k: re-render, ${spectrum#"$lib/"} changed: $r"
		done
		cp "$work/spectrum.orig" "$spectrum" # the library as generated, for later runs
		full=$(med 1 %.2f "$work/sky-$n.txt")
		same=$(med 1 %.2f "$work/same-$n.txt")
		changed=$(med 1 %.2f "$work/changed-$n.txt")
		rows+=("| $(printf "%'d" "$n") | $(cell "$work/sky-$n.txt") | $(cell "$work/same-$n.txt") | $(cell "$work/changed-$n.txt") | $(awk -v a="$same" -v b="$full" 'BEGIN { printf "%.0f %%", 100 * a / b }') | $(awk -v a="$changed" -v b="$full" 'BEGIN { printf "%.0f %%", 100 * a / b }') |")
		;;
	esac
done

load_end=$(cut -d' ' -f1-3 /proc/loadavg)
echo
case $mode in
index)
	echo "| materials | render (s) | index.html (KB) | first load with CSS and scripts (KB) | load, median (ms) | load, slowest (ms) | rows.js (KB) | first sort, median (ms) |"
	echo "| ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |"
	;;
changed)
	echo "| materials | full render, s (CPU s) | re-render, nothing changed, s (CPU s) | re-render, one material changed, s (CPU s) | unchanged / full | changed / full |"
	echo "| ---: | ---: | ---: | ---: | ---: | ---: |"
	;;
*)
	echo "| materials | skysheet render (s) | lab script (s) | lab / skysheet | skysheet CPU (s) | lab script CPU (s) | skysheet peak RSS (MiB) | lab script peak RSS (MiB) |"
	echo "| ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |"
	;;
esac
printf '%s\n' "${rows[@]}"
echo
pyver=""
if [ "$mode" = full ] || [ "$mode" = lab ]; then
	pyver="; lab script: $("$python" -c 'import sys, numpy, matplotlib; print("Python %d.%d.%d, numpy %s, matplotlib %s" % (sys.version_info[:3] + (numpy.__version__, matplotlib.__version__)))'), $lab_jobs process(es)"
fi
if [ "$mode" = index ]; then
	echo "One render per size (wall time). The index opened from file:// $reps times (after one warm-up run), each in a fresh" \
		"headless $("$chromium" --version 2>/dev/null || echo chromium) with an empty profile; load = navigation start to the end of the" \
		"load event (the page's navigation timing); first sort = click on the solar reflectance heading to the sorted rows, the rows" \
		"script loaded. KB = 1000 bytes."
fi
echo "Medians of $reps runs; wall time and peak RSS per process, CPU = user + system. $cores cores (nproc)${cpu:+, $cpu}${mem:+, $mem RAM};" \
	"load average ${load_start// /, } at the start, ${load_end// /, } at the end. $version (\`$SKYSHEET_RENDER\`, $rev)$pyver; seed $seed."
rm -rf "$work/trash" # the outputs set aside between runs
