#!/usr/bin/env bash
# The generated manual page (build/plumb.1) renders without a warning from groff and documents every
# command and every option that the binary's own help lists, so that the two cannot drift apart.
# Usage: manual_page_test.sh PLUMB_BINARY MANUAL_PAGE
set -uo pipefail
plumb=$1 page=$2
failures=0
fail() { echo "FAIL $*"; failures=$((failures + 1)); }

warnings=$(groff -man -Tutf8 -ww "$page" 2>&1 >/dev/null)
[[ -z $warnings ]] || fail "groff warns: $warnings"
text=$(groff -man -Tascii -P-cbou "$page" 2>/dev/null)
for section in NAME SYNOPSIS DESCRIPTION OPTIONS COMMANDS ENVIRONMENT FILES "EXIT STATUS" EXAMPLES; do
  grep -q "^$section\$" <<<"$text" || fail "section $section missing"
done
# Every command of `plumb --help`, and every option of its own --help, appears in the manual page.
commands=$("$plumb" --help | sed -n '/^commands:/,/^$/p' | sed -n 's/^  \([a-z-]*\( [a-z-]*\)\?\)  .*/\1/p' |
           sed 's/ *$//')
[[ $(wc -l <<<"$commands") -ge 20 ]] || fail "plumb --help lists fewer than 20 commands: $commands"
while read -r command; do
  grep -q "^   plumb $command\$" <<<"$text" || fail "command '$command' has no entry"
  # shellcheck disable=SC2086
  for option in $("$plumb" $command --help | sed -n 's/^  --\([a-z0-9-]*\).*/\1/p' | grep -vx help); do
    grep -q -- "--$option" <<<"$text" || fail "option --$option of '$command' missing"
  done
done <<<"$commands"
if (( failures > 0 )); then
  echo "$failures problem(s) in $page"
  exit 1
fi
echo "manual page renders cleanly and covers $(wc -l <<<"$commands") commands"
