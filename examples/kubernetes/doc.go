// Package kubernetes holds the Kubernetes Indexed Job of the README
// (sweep-job.yaml), which runs the Slurm array job's script
// (examples/slurm/sweep.sh) with the completion index as the shard.
//
// It is a module of its own so that the Kubernetes API types its test
// decodes the manifest into stay out of lyacert's dependencies; run its test
// from this folder: go test ./...
package kubernetes
