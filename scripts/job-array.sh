#!/usr/bin/env bash
# Measure one study on a Slurm cluster as a job array: task k of N measures shard k/N of the clips
# (split by a hash of toss_id, so no task needs to know about the others) into "$OUT/shard-k".
#
#   INPUT=/data/academy-2025/clips OUT=/scratch/$USER/academy-2025 sbatch --array=1-16 scripts/job-array.sh
#
# Set the array size on the command line (it wins over the #SBATCH line below) or edit that line.
# Every task must see the same INPUT path, manifest and options: `tossmeter merge` refuses shards made
# with different options or tool/ffmpeg versions. When every task has finished, join the shards:
#
#   npx tossmeter merge "$OUT"/shard-* --out "$OUT/dataset"
#
# or chain it: sbatch --dependency=afterok:<array job id> --wrap 'npx tossmeter merge "$OUT"/shard-* --out "$OUT/dataset"'
# A task that failed can be run again alone; give the shard count then, Slurm counts only that one task:
#   INPUT=... OUT=... SHARDS=16 sbatch --array=3 scripts/job-array.sh
# Clips that are flagged or fail do not fail the task (they are rows of the dataset with their status);
# a usage error (exit code 2: bad option, no clips, bad manifest) does.
#
#SBATCH --job-name=tossmeter
#SBATCH --array=1-8
#SBATCH --cpus-per-task=4
#SBATCH --mem=4G
#SBATCH --time=02:00:00
#SBATCH --output=tossmeter-%A_%a.log

set -euo pipefail

: "${INPUT:?set INPUT to the folder of clips (or export it before sbatch)}"
: "${OUT:?set OUT to the folder that receives shard-1 .. shard-N}"
: "${SLURM_ARRAY_TASK_ID:?run this script with sbatch --array=1-N}"
: "${SLURM_ARRAY_TASK_COUNT:?run this script with sbatch --array=1-N}"
CPUS="${SLURM_CPUS_PER_TASK:-1}"
SHARD="${SLURM_ARRAY_TASK_ID}"
COUNT="${SHARDS:-$SLURM_ARRAY_TASK_COUNT}"
# Extra measure options, the same for every task, e.g. EXTRA="--fps 1000 --coin-mm 23.25".
read -r -a EXTRA_ARGS <<< "${EXTRA:-}"

# Without SHARDS the array must be 1..N with no gaps: shard k of N is the task with SLURM_ARRAY_TASK_ID = k.
if [ -z "${SHARDS:-}" ] && { [ "${SLURM_ARRAY_TASK_MIN:-1}" != "1" ] || [ "${SLURM_ARRAY_TASK_MAX:-$COUNT}" != "$COUNT" ]; }; then
  echo "job-array.sh: submit with --array=1-N, or set SHARDS=N to rerun some tasks (got ${SLURM_ARRAY_TASK_MIN:-?}-${SLURM_ARRAY_TASK_MAX:-?})" >&2
  exit 2
fi
if [ "$SHARD" -lt 1 ] || [ "$SHARD" -gt "$COUNT" ]; then
  echo "job-array.sh: task ${SHARD} is outside shards 1..${COUNT}" >&2
  exit 2
fi

mkdir -p "$OUT"
echo "tossmeter shard ${SHARD}/${COUNT} of \"$INPUT\" on $(hostname) with ${CPUS} cores"
status=0
npx tossmeter measure "$INPUT" --out "$OUT/shard-$SHARD" --shard "${SHARD}/${COUNT}" --jobs "$CPUS" "${EXTRA_ARGS[@]}" || status=$?
if [ "$status" -eq 1 ]; then
  echo "some clips were flagged or failed: see the status and error columns of $OUT/shard-$SHARD/tosses.csv"
  status=0
fi
exit "$status"
