#!/bin/bash
# lyacert sweep as a Slurm array job: array task i of N sweeps shard i/N of
# the grid into out-i.jsonl in the submit directory. Submit and merge:
#
#   sbatch --array=0-15 sweep.sh
#   lyacert merge out-*.jsonl -o all.jsonl
#
# A task that was stopped (time limit, node failure, scancel) continues where
# it stopped when it runs again: requeue it, or submit that element alone
# with the shard count given, e.g. task 5 of 16:
#
#   LYACERT_SHARDS=16 sbatch --array=5 sweep.sh
#
# Two runs of one shard never write together: while one holds the lock of
# out-i.jsonl (out-i.jsonl.lock) a second stops at once with exit status 2,
# touching nothing; requeue it when the first is gone.
#
# Settings, from the environment of sbatch (exported to the job by default):
#   LYACERT          the lyacert binary (default: lyacert on PATH)
#   LYACERT_MODEL    the model file (default: model.lya)
#   LYACERT_GRID     the grid, as lyacert sweep arguments (default below)
#   LYACERT_SHARDS   the number of shards N (default: the size of the array)
#   LYACERT_TIMEOUT  stop cleanly after this long; keep it below --time
#                    (0: no limit)
#   LYACERT_JOBS     workers outside Slurm (in Slurm: --cpus-per-task)
#SBATCH --job-name=lyacert-sweep
#SBATCH --cpus-per-task=8
#SBATCH --time=04:00:00
#SBATCH --output=sweep-%A_%a.log
set -euo pipefail

lyacert=${LYACERT:-lyacert}
model=${LYACERT_MODEL:-model.lya}
read -r -a grid <<<"${LYACERT_GRID:---grid a=0..10 --grid b=0..5 --points a=2001 --points b=1001}"
# The shard: the array task (Slurm) or the completion index (Kubernetes
# Indexed Job, examples/kubernetes/sweep-job.yaml).
shards=${LYACERT_SHARDS:-${SLURM_ARRAY_TASK_COUNT:?submit as an array job (sbatch --array=0-N) or set LYACERT_SHARDS}}
shard=${SLURM_ARRAY_TASK_ID:-${JOB_COMPLETION_INDEX:?submit as an array job: sbatch --array=0-$((shards - 1))}}
jobs=${SLURM_CPUS_PER_TASK:-${LYACERT_JOBS:-1}}
out=out-$shard.jsonl

status=0
"$lyacert" sweep "$model" "${grid[@]}" --shard "$shard/$shards" \
	--jobs "$jobs" --timeout "${LYACERT_TIMEOUT:-3h50m}" \
	--resume -o "$out" || status=$?

# lyacert exits 0 or 1 when the sweep finished (1: some grid point's own
# equilibrium is not certified stable, a result, not a failure), 3 when it
# stopped early (--timeout, a signal) and 2 on bad input or a held lock;
# only the finished shard has its output renamed from $out.partial to $out.
if [ "$status" -ge 2 ] || [ ! -e "$out" ]; then
	echo "shard $shard/$shards unfinished (lyacert exit status $status): requeue this task to continue" >&2
	exit "$((status > 0 ? status : 1))"
fi
