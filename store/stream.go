package store

import (
	"context"
	"errors"
	"fmt"

	"tidesift/schema"
)

// RecordSource produces the records of one import: it calls yield with each
// record in order and returns the error that stopped it (nil at the end of
// the input). The *Record may be reused after yield returns: its fields are
// copied (a shallow copy, so its slices must not be reused), as
// importers.ReadStream allows, and ImportStream may complete the values of
// its Params in place (a default source and status). When yield returns an
// error the source must stop and return it.
//
// ImportStream may call the source again from the start when another process
// held the catalog and the transaction is retried: it must then produce the
// same records (reopen the file).
type RecordSource func(yield func(*schema.Record) error) error

// streamBatch is how many records travel together from the reading goroutine
// to the writing one: large enough that the channel costs nothing per
// record, small enough that the batches in flight hold little memory.
const streamBatch = 512

// streamDepth is how many batches may wait between reader and writer.
const streamDepth = 4

// errStopped tells a source that the import stopped for another reason.
var errStopped = errors.New("import stopped")

// ImportStream is Import for inputs too large to hold as records: it applies
// the records as the source produces them, in ONE transaction, so that the
// import is still all or nothing. A source error (a bad row found at the end
// of the file) rolls everything back and is returned wrapped, as is an error
// of any record. req.Records must be empty.
//
// The source runs on its own goroutine while this one writes, so parsing and
// storing overlap. Memory stays flat in the input's size (unless the request
// asks for every change in ImportResult.Changes: set OmitAdded or
// OmitChanges for a large first import).
//
// The duplicate-file check needs req.SHA256 before the first record: hash the
// file first (a pass at disk speed), and have the source fail if the bytes it
// read hash differently (the file changed in between).
func (s *Store) ImportStream(ctx context.Context, req ImportRequest, records RecordSource) (*ImportResult, error) {
	if s.readOnly {
		return nil, fmt.Errorf("import %s: %w", req.File, ErrReadOnly)
	}
	if len(req.Records) > 0 {
		return nil, fmt.Errorf("import %s: ImportStream takes its records from the source, not req.Records", req.File)
	}
	sum, err := checkSum(req)
	if err != nil {
		return nil, err
	}
	var res *ImportResult
	err = withRetry(ctx, func() error {
		var err error
		res, err = s.importTx(ctx, req, sum, func(apply func(*prepared, int) error, pp *preparer) error {
			return pipe(ctx, records, apply, pp)
		})
		return err
	})
	if err != nil {
		return nil, describe(err)
	}
	return res, nil
}

// pipe runs the source on a goroutine, which also prepares each record (see
// prepare), hands them over in batches and applies them on this one. It
// returns the first error of either side, after the source has stopped.
func pipe(ctx context.Context, records RecordSource, apply func(*prepared, int) error, pp *preparer) error {
	full := make(chan []prepared, streamDepth)
	free := make(chan []prepared, streamDepth+2)
	stop := make(chan struct{})
	var srcErr error
	done := make(chan struct{})
	go func() {
		defer close(done)
		defer close(full)
		buf := make([]prepared, 0, streamBatch)
		send := func() error {
			select {
			case full <- buf:
			case <-stop:
				return errStopped
			case <-ctx.Done():
				return ctx.Err()
			}
			select {
			case buf = <-free:
				buf = buf[:0]
			default:
				buf = make([]prepared, 0, streamBatch)
			}
			return nil
		}
		srcErr = records(func(r *schema.Record) error {
			buf = append(buf, prepared{rec: *r})
			// The source does not reuse a record's slices (see
			// RecordSource), so its values may be completed in place.
			pp.prepare(&buf[len(buf)-1], true)
			if len(buf) == streamBatch {
				return send()
			}
			return nil
		})
		if srcErr == nil && len(buf) > 0 {
			srcErr = send()
		}
	}()
	i := 0
	var applyErr error
	for batch := range full {
		if applyErr == nil {
			for j := range batch {
				if applyErr = apply(&batch[j], i); applyErr != nil {
					close(stop) // the source returns errStopped; keep draining
					break
				}
				i++
			}
		}
		clear(batch) // drop references to the records' strings and params
		select {
		case free <- batch:
		default:
		}
	}
	<-done
	if applyErr != nil {
		return applyErr
	}
	if srcErr != nil {
		if errors.Is(srcErr, context.Canceled) || errors.Is(srcErr, context.DeadlineExceeded) {
			return srcErr
		}
		return &SourceError{Err: srcErr}
	}
	return ctx.Err()
}

// SourceError is an error of an ImportStream's record source (a file's
// problem found while reading it), as opposed to one of the catalog.
type SourceError struct{ Err error }

func (e *SourceError) Error() string { return e.Err.Error() }
func (e *SourceError) Unwrap() error { return e.Err }
