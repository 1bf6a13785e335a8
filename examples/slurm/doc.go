// Package slurm holds the Slurm array job script of the README (sweep.sh)
// and the test that runs it on a real single-node Slurm cluster: every array
// task sweeps one shard of a grid, lyacert merge joins the shards, and the
// result must equal an unsharded sweep byte for byte, also when a task is
// stopped mid-run and continued with --resume.
//
// The test starts munged, slurmctld and slurmd itself, with a configuration,
// key, sockets and state in a temporary folder (SLURM_CONF points there), so
// nothing of the machine's own Slurm or munge setup is touched. It runs only
// when LYACERT_SLURM=1 (.ci/run sets it); it needs root and Debian's
// slurmctld, slurmd, slurm-client and munge packages.
package slurm
