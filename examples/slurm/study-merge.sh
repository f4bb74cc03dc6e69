#!/bin/bash
# Join the shards written by study-array.sh into $OUT/all (results identical to a single run) and
# write the report there. Submit after the array: sbatch --dependency=afterok:<array job id> ...
#SBATCH --job-name=bandbend-merge
#SBATCH --cpus-per-task=1
#SBATCH --time=01:00:00
#SBATCH --output=bandbend-merge-%j.out
set -euo pipefail
: "${OUT:?set OUT to the output folder of the whole study}"
BANDBEND=${BANDBEND:-bandbend}
shopt -s nullglob
shards=("$OUT"/shard-*-of-*)
if [ ${#shards[@]} -eq 0 ]; then echo "no shard folders in $OUT" >&2; exit 2; fi
# shellcheck disable=SC2086
exec $BANDBEND study merge "${shards[@]}" --out "$OUT/all"
