# Sourced by the scripts that do not go through setup.sh (db.sh, backup.sh): reads .env into the
# environment, without overriding variables already set (a caller's DB_NAME=… always wins, so a
# script run for the e2e or test database never falls back to the one named in .env).
if [ -f .env ]; then
  while IFS= read -r line || [ -n "$line" ]; do
    case "$line" in '' | \#*) continue ;; esac
    key=${line%%=*}
    val=${line#*=}
    [[ $key =~ ^[A-Za-z_][A-Za-z0-9_]*$ ]] || continue
    if [ -z "${!key+x}" ]; then
      val=${val%\"}; val=${val#\"}; val=${val%\'}; val=${val#\'}
      export "$key=$val"
    fi
  done < .env
fi
