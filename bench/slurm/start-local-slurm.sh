#!/usr/bin/env bash
# Starts a one-machine SLURM cluster (controller and compute node on this host) for trying the batch
# command's job arrays without a real cluster. Needs root and Debian's slurm-wlm and munge packages, which
# it installs if missing. Everything it writes lives in $DENDROKIN_SLURM_DIR (default /tmp/dendrokin-slurm);
# stop-local-slurm.sh stops exactly the daemons started here.
#
# Usage: bench/slurm/start-local-slurm.sh       then: export SLURM_CONF=/tmp/dendrokin-slurm/slurm.conf
set -euo pipefail

DIR="${DENDROKIN_SLURM_DIR:-/tmp/dendrokin-slurm}"
if [ "$(id -u)" != 0 ]; then
    echo "start-local-slurm.sh must run as root (it starts munged, slurmctld and slurmd)." >&2
    exit 2
fi
if ! command -v slurmctld >/dev/null || ! command -v munged >/dev/null; then
    apt-get update -q
    DEBIAN_FRONTEND=noninteractive apt-get install -y -q slurm-wlm munge
fi

HOST="$(hostname -s)"
CPUS="$(nproc)"
MEM_MB="$(awk '/MemTotal/ {print int($2 / 1024 * 0.8)}' /proc/meminfo)"
mkdir -p "$DIR"/{state,spool,log,run}

# munge: the key made by the package, or a fresh one
if [ ! -s /etc/munge/munge.key ]; then
    mungekey --create --keyfile=/etc/munge/munge.key 2>/dev/null \
        || dd if=/dev/urandom of=/etc/munge/munge.key bs=1 count=1024 status=none
fi
chown munge:munge /etc/munge/munge.key && chmod 400 /etc/munge/munge.key
mkdir -p /run/munge /var/log/munge /var/lib/munge
chown munge:munge /run/munge /var/log/munge /var/lib/munge
if [ ! -s "$DIR/run/munged.pid" ] || ! kill -0 "$(cat "$DIR/run/munged.pid")" 2>/dev/null; then
    runuser -u munge -- /usr/sbin/munged
    sleep 1
    # munged keeps its pid file in /run/munge; a copy here lets stop-local-slurm.sh stop exactly this one
    cp /run/munge/munged.pid "$DIR/run/munged.pid"
fi

cat > "$DIR/slurm.conf" <<CONF
# One-host SLURM for trying Dendrokin's job arrays; written by bench/slurm/start-local-slurm.sh
ClusterName=dendrokin-local
SlurmctldHost=$HOST
SlurmUser=root
SlurmdUser=root
AuthType=auth/munge
CredType=cred/munge
StateSaveLocation=$DIR/state
SlurmdSpoolDir=$DIR/spool
SlurmctldPidFile=$DIR/run/slurmctld.pid
SlurmdPidFile=$DIR/run/slurmd.pid
SlurmctldLogFile=$DIR/log/slurmctld.log
SlurmdLogFile=$DIR/log/slurmd.log
SlurmctldPort=6817
SlurmdPort=6818
ProctrackType=proctrack/linuxproc
TaskPlugin=task/none
SchedulerType=sched/backfill
SelectType=select/cons_tres
SelectTypeParameters=CR_Core_Memory
JobAcctGatherType=jobacct_gather/linux
JobAcctGatherFrequency=5
AccountingStorageType=accounting_storage/none
JobCompType=jobcomp/filetxt
JobCompLoc=$DIR/log/jobcomp.txt
ReturnToService=2
MpiDefault=none
SlurmctldTimeout=30
SlurmdTimeout=60
NodeName=$HOST CPUs=$CPUS RealMemory=$MEM_MB State=UNKNOWN
PartitionName=local Nodes=$HOST Default=YES MaxTime=INFINITE State=UP
CONF
# No cgroup.conf: slurmd finds the cgroup version itself (TaskPlugin=task/none does not confine jobs).
export SLURM_CONF="$DIR/slurm.conf"

/usr/sbin/slurmctld -f "$SLURM_CONF"
/usr/sbin/slurmd -f "$SLURM_CONF"
for _ in $(seq 1 30); do
    if sinfo -h -o '%T' 2>/dev/null | grep -qE '^(idle|mixed|allocated)'; then
        break
    fi
    sleep 1
done
sinfo
echo "Local SLURM is up. In your shell: export SLURM_CONF=$SLURM_CONF"
