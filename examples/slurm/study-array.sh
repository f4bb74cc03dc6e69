#!/bin/bash
# One shard of a bandbend study per task of a Slurm job array.
#
#   STUDY=screen.yaml OUT=/scratch/$USER/screen sbatch --array=1-16 examples/slurm/study-array.sh
#   ... when every task has finished:
#   STUDY=screen.yaml OUT=/scratch/$USER/screen sbatch --dependency=afterok:<array job id> examples/slurm/study-merge.sh
#
# Task K of N (SLURM_ARRAY_TASK_ID = K, SLURM_ARRAY_TASK_COUNT = N; use a contiguous --array=1-N)
# computes the points i with i % N == K - 1 into $OUT/shard-K-of-N. --resume makes a requeued or
# resubmitted task continue from its complete rows instead of starting over; a task that finished
# has nothing left to do. BANDBEND may name another launcher, e.g. BANDBEND="node /opt/bandbend/bin/bandbend.js".
#SBATCH --job-name=bandbend-study
#SBATCH --array=1-4
#SBATCH --cpus-per-task=2
#SBATCH --time=08:00:00
#SBATCH --requeue
#SBATCH --output=bandbend-study-%A_%a.out
set -euo pipefail
: "${STUDY:?set STUDY to the study file}"
: "${OUT:?set OUT to the output folder of the whole study}"
K=${SLURM_ARRAY_TASK_ID:?submit with sbatch --array=1-N}
N=${SLURM_ARRAY_TASK_COUNT:?submit with sbatch --array=1-N}
BANDBEND=${BANDBEND:-bandbend}
mkdir -p "$OUT"
# word splitting of $BANDBEND is intended (a launcher with arguments)
# shellcheck disable=SC2086
exec $BANDBEND study "$STUDY" --out "$OUT/shard-$K-of-$N" --shard "$K/$N" --jobs "${SLURM_CPUS_PER_TASK:-1}" --resume --no-plots
