#!/usr/bin/env bash
# The generated bash completion (build/plumb.bash-completion) completes real words: nouns, a noun's verbs,
# a command's options, and files where the value is a path. Usage: bash_completion_test.sh COMPLETION_FILE
set -uo pipefail
completion=$1
# shellcheck source=/dev/null
source "$completion" || { echo "cannot source $completion"; exit 1; }
scratch=$(mktemp -d)
trap 'rm -rf "$scratch"' EXIT
cd "$scratch" && touch readings-week48.csv readings-week49.csv notes.txt && mkdir run-files

failures=0
# expect "WORDS ON THE LINE" "EXPECTED COMPLETIONS": the last word is the one being completed.
expect() {
  local line=$1 expected=$2
  read -r -a COMP_WORDS <<<"$line"
  [[ $line == *" " ]] && COMP_WORDS+=("")
  COMP_CWORD=$(( ${#COMP_WORDS[@]} - 1 ))
  COMPREPLY=()
  _plumb
  local got
  got=$(printf '%s\n' "${COMPREPLY[@]}" | sort | tr '\n' ' ' | sed 's/ $//')
  if [[ $got == "$expected" ]]; then
    echo "ok   '$line' -> '$got'"
  else
    echo "FAIL '$line' -> '$got', expected '$expected'"
    failures=$((failures + 1))
  fi
}

expect "plumb che" "check"
expect "plumb --db lab.db che" "check"
expect "plumb --ver" "--version"
expect "plumb check re" "record"
expect "plumb check record --wei" "--weight"
expect "plumb check record BAL-A --procedure calibration --mod" "--model"
expect "plumb balance set-calibration AB-01 --decision" "--decision-rule"
expect "plumb check record BAL-A --readings read" "readings-week48.csv readings-week49.csv"
expect "plumb check record BAL-A --readings run" "run-files"
expect "plumb check import read" "readings-week48.csv readings-week49.csv"
expect "plumb --db no" "notes.txt"
expect "plumb check record BAL-A --on " ""
expect "plumb summary --format " ""  # a format, not a file
expect "plumb due --wit" "--within"
expect "plumb dem" "demo"
expect "plumb nosuchnoun --" ""

if (( failures > 0 )); then
  echo "$failures completion(s) wrong"
  exit 1
fi
echo "all completions as expected"
