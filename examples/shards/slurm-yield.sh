#!/usr/bin/env bash
# examples/shards/slurm-yield.sh - a Monte Carlo yield split over a Slurm
# job array, then merged into the one report the unsharded run gives.
#
#   examples/shards/slurm-yield.sh             submit: the array and the merge after it
#
# Run from a directory every node sees (a shared file system): the shards
# are written to shards/ beside it and the merge reads them there.  The
# same script is each array task: Slurm starts it with
# SLURM_ARRAY_TASK_ID set, and it judges that shard.
#
# Settings (environment):
#   BOOTRUNG  the program (default: bootrung on PATH, else build/bootrung)
#   DESIGN    the design file (default examples/leg-7level.xml)
#   SHARDS    number of array tasks (default 8)
#   SAMPLES   Monte Carlo samples in all (default 2000)
#   THREADS   threads per task (default 2; also the cores asked of Slurm)
#   OUT       where the merge writes its report (default shards/yield.txt)
#   SBATCH_ARGS  more options for sbatch (a partition, an account, a time limit)
set -euo pipefail

bootrung=${BOOTRUNG:-$(command -v bootrung || echo build/bootrung)}
design=${DESIGN:-examples/leg-7level.xml}
shards=${SHARDS:-8}
samples=${SAMPLES:-2000}
threads=${THREADS:-2}
out=${OUT:-shards/yield.txt}

# Every shard and the merge must see the same arguments: they are part of
# what merge checks.
args=(yield --samples "$samples" --seed 1 --threads "$threads" --csv shards/yield.csv "$design")

if [ -n "${SLURM_ARRAY_TASK_ID:-}" ]; then
    # one array task: shard K of N
    exec "$bootrung" "${args[@]}" \
        --shard "$SLURM_ARRAY_TASK_ID/$shards" --shard-file "shards/part-$SLURM_ARRAY_TASK_ID.shard"
fi

mkdir -p shards
rm -f shards/part-*.shard
# shellcheck disable=SC2086 # SBATCH_ARGS holds several options on purpose
array=$(sbatch --parsable ${SBATCH_ARGS:-} --job-name=bootrung-yield --array="1-$shards" \
    --cpus-per-task="$threads" --output=shards/task-%a.log \
    --export=ALL,BOOTRUNG="$bootrung",DESIGN="$design",SHARDS="$shards",SAMPLES="$samples",THREADS="$threads" \
    "$0")
array=${array%%;*}
# the merge once every task has ended well; its status is the verb's
# shellcheck disable=SC2086
merge=$(sbatch --parsable ${SBATCH_ARGS:-} --job-name=bootrung-merge \
    --dependency="afterok:$array" --output="$out" \
    --wrap="'$bootrung' merge shards/part-*.shard")
echo "submitted array $array ($shards tasks) and merge ${merge%%;*}; report in $out"
