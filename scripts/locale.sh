#!/usr/bin/env bash
# Makes sure the de_DE.UTF-8 locale (decimal comma) exists, generating it if needed.
set -euo pipefail
if locale -a 2>/dev/null | grep -qi '^de_DE\.utf-\?8$'; then exit 0; fi
SUDO=""
if [ "$(id -u)" -ne 0 ]; then SUDO="sudo"; fi
if [ -f /etc/locale.gen ] && grep -q 'de_DE.UTF-8 UTF-8' /etc/locale.gen; then
  $SUDO sed -i 's/^# *de_DE.UTF-8 UTF-8/de_DE.UTF-8 UTF-8/' /etc/locale.gen
  $SUDO locale-gen >/dev/null
else
  $SUDO localedef -i de_DE -f UTF-8 de_DE.UTF-8
fi
locale -a | grep -qi '^de_DE\.utf-\?8$'
