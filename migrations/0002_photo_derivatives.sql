-- Photos get their pixel size and a perceptual hash, computed at intake from the
-- decoded pixels. The thumbnail and display derivatives are files beside the original
-- (see server/src/intake/photos.rs), not rows.
--
-- phash: 64-bit DCT perceptual hash of the upright image, 16 hex digits; near-duplicate
-- photos differ in few bits (Hamming distance). NULL for photos stored before this
-- migration until their derivatives are made again.

ALTER TABLE photos ADD COLUMN width INTEGER;
ALTER TABLE photos ADD COLUMN height INTEGER;
ALTER TABLE photos ADD COLUMN phash TEXT;
