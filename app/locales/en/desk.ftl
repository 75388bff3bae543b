# The desk's words in English, in the desk's bundle only (the phone's bundle never
# carries them): the desk's page and sign-in, review, live animals, samples, carcasses,
# people, figures and downloads. Same rules as app.ftl; ids differ from app.ftl's.

## The desk's page and sign-in (desk)

desk-title = wrackline · desk
desk-urgent = Live animals
desk-samples = Samples
desk-people = People
desk-record = Record a find
desk-checking = checking your sign-in…
sign-in-heading = Sign in
sign-in-username = Username
sign-in-password = Password
sign-in-button = Sign in

## Live animals for responders (desk)

urgent-heading = Live animals
urgent-keep-back = Keep back, and keep dogs and people back: a shark can bite and a ray's spine can sting, even when it seems weak.
urgent-local-rules = Local rules and the directions of the responders in charge come first. Watch the tide.
urgent-none = No live animals reported.
urgent-awaiting = awaiting a response
urgent-answered = response logged
urgent-unnamed = unnamed
urgent-within = { " " }(within { $metres } m)
urgent-no-place = no position given
urgent-map = open in the map app
urgent-web-map = OpenStreetMap
urgent-finder-wrote = The finder wrote: “{ $notes }”
urgent-nothing-written = The finder wrote nothing more.
urgent-finder = Finder: { $name } · { $contact }
urgent-no-name = no name given
urgent-no-contact = no contact given
urgent-not-told = No notification channel is set up for the responders.
urgent-photo = photo { $number } of the animal
urgent-time = seen { $seen } · received { $received }
urgent-log = Log a response
urgent-close-form = Close the form
urgent-reload = Refresh

## A live animal's responses (desk)

response-log-heading = Response log
response-none = No response logged yet.
response-went = : { $who } went, { $at }
response-logged-by = { " " }(logged by { $who } on { $at })
response-who = Who went
response-when = When they reached it (or stopped looking)
response-outcome = Outcome
response-choose = choose…
response-notes = Notes
response-save = Log the response
response-saved = Response logged.
outcome-returned-to-sea = returned to sea
outcome-died = died
outcome-euthanised = euthanised by a vet
outcome-not-found = not found
outcome-carcass-removed = carcass removed
on-record-live = A live animal
on-record-caution = Whoever goes: keep back from it, do not push it back to sea unless trained, and follow the responders in charge and local rules.

## Samples (desk)

samples-heading = Samples
samples-none = No samples yet.
samples-line = { $code } · { $kind } · { $preservation } · stored at { $stored_at } · held by { $held_by }{ $notes } (added by { $added_by } on { $added_at }{ $changed })
samples-changed-at = ; changed { $at }
samples-kind = Kind
samples-code = Sample id or barcode (type or scan)
samples-preservation = Preservation
samples-stored-at = Where it is stored
samples-held-by = Who holds it
samples-add = Add the sample
samples-save-change = Save the change
samples-change = Change
samples-cancel = Cancel the change
samples-added = Sample added.
samples-changed = Sample changed.
samples-add-legend = Add a sample
samples-change-legend = Change sample { $code }
sample-kind-tissue = tissue for genetics
sample-kind-vertebrae = vertebrae
sample-kind-stomach-contents = stomach contents
sample-kind-whole-carcass = whole carcass
sample-kind-other = other
preservation-ethanol = in ethanol
preservation-frozen = frozen
preservation-dried = dried
preservation-formalin = in formalin
preservation-other = other

## Carcass and necropsy (desk)

carcass-heading = Carcass and necropsy
carcass-none = Nothing recorded about the carcass yet.
carcass-fate = What became of the carcass
carcass-examined = Examined on (leave empty if not examined)
carcass-condition = Body condition
carcass-stomach = Stomach
carcass-injuries = Injuries: wounds, hooks, net marks, disease
carcass-notes = Other findings and notes
carcass-not-said = not recorded
carcass-save = Save the carcass report
carcass-saved = Carcass report saved.
carcass-shown-fate = fate: { $value }
carcass-shown-examined = examined: { $value }
carcass-shown-condition = body condition: { $value }
carcass-shown-stomach = stomach: { $value }
carcass-shown-injuries = injuries: { $value }
carcass-shown-notes = notes: { $value }
carcass-recorded-by = recorded by { $who } on { $at }
fate-left-where-found = left where found
fate-buried = buried
fate-removed-for-disposal = removed for disposal
fate-taken-for-study = taken for study
fate-washed-away = washed away
fate-unknown = unknown
body-condition-good = good
body-condition-fair = fair
body-condition-poor = poor
body-condition-emaciated = emaciated
stomach-empty = empty
stomach-some-food = some food
stomach-full = full
stomach-not-examined = not examined

## Finding an animal by a sample (desk)

lookup-heading = Find an animal by a sample
lookup-hint = Type the sample's id, or scan its barcode into the box.
lookup-code = Sample id or barcode
lookup-find = Find
lookup-the-sample = This sample
lookup-the-animal = The animal
lookup-all-samples = Every sample of this animal
lookup-trail = Changes
lookup-seen = seen { $at } at { $place }
lookup-record = record { $id }
lookup-carcass = Carcass: { $fate } (recorded by { $who } on { $day })

## Review states (desk)

state-awaiting-review = awaiting review
state-details-requested = details requested
state-confirmed = confirmed
state-not-confirmable = not confirmable
state-merged = merged

## Range and trend figures (desk)

figures-heading = Range and trend
figures-caveat = These figures are inputs to a threatened-species assessment, not a listing decision: the official assessment process weighs them with all other evidence.
figures-taxon = Taxon (species, genus, family…)
figures-records = Records
figures-confirmed-only = confirmed only
figures-all-records = all, reviewed or not
figures-first-period = First period
figures-first-period-example = e.g. 2015-2019
figures-second-period = Second period
figures-second-period-example = e.g. 2020-2024
figures-generation = Generation length, years (if the checklist has none)
figures-show = Show
figures-choose = choose a taxon and press Show
figures-range-empty = No records with a position to work from ({ $used }). Records count once reviewers confirm them; choose "all, reviewed or not" under Records to see every stored record.
figures-eoo-raised = { " " }EOO was raised to the AOO because the hull is smaller (IUCN Guidelines §4.9).
figures-range-of = Range of { $name }
figures-records-used = Records used: { $used }.
figures-figure = Figure
figures-change = Change
figures-range-method = EOO: area of the minimum convex polygon round the records, geodesic on WGS84 (raised to the AOO when smaller). AOO: occupied 2 × 2 km cells × 4 km². Least AOO: the fewest occupied cells over 16 grid origins shifted by quarter cells. Sites: positions at least about 10 m apart.
figures-criterion-b = Criterion B
figures-trend-years = Trend { $first }–{ $last }
figures-criterion-a = Criterion A
figures-map-heading = Where: records, hull (EOO) and occupied 2 × 2 km cells (AOO)
figures-chart-heading = Encounter rate by year
figures-chart-hint = Animals per km walked on walks where every find was reported (per year where no such walk is stored), with the fitted trend and its 95% band.
figures-recording-caution = Stranding and landing records show where people walk, fish and report, and where currents carry carcasses; a gap in the records is not a gap in the range.

## Review (desk)

review-heading = Review
review-decisions-kept = Decisions are kept with who made them and when.
zoom-label = photo, zoomable
zoom-fit = Fit
zoom-original = Original (with EXIF)
zoom-close = Close
zoom-image = the photo, large
review-sign-out = Sign out
queue-filters =
    Filters{ $set ->
        [0] {""}
       *[other] { " " }({ $set } set)
    }
queue-show = Show
queue-to-review = to review
queue-all = all
queue-taxon = Species or group
queue-taxon-example = e.g. Rajidae, tope
queue-area = Area
queue-anywhere = anywhere
queue-from = From
queue-to = To
queue-flag = Flag
queue-any-flag = any or none
queue-filter = Filter
queue-clear = Clear
queue-count = { $count } record(s){ $more }
queue-more-below = , more below
queue-load-more = Load more
flag-oversize = oversize
flag-out-of-range = out of range
flag-possible-duplicate = possible duplicate
flag-photo-older = photo older than the record
flag-photo-far = photo far from the record
duplicates-heading = Possibly the same animal
duplicates-none = No other report looks like the same animal.
duplicates-length = { $cm } cm { $kind }
duplicates-no-length = no length
duplicates-photo = photo of the other report
duplicates-score = match score { $score } of 1
duplicates-apart = { " " }· { $distance } · { $hours } h apart · { $here } here, { $there } there
duplicates-metres-apart = { $metres } m apart
duplicates-distance-unknown = distance unknown
duplicates-other = { $what } on { $at } · { $state }
duplicates-decided = Decided: { $decision }
duplicates-same = Same animal
duplicates-different = Different animals
duplicates-undo = Undo the merge

## One record under review (desk)

record-back = ← Back to the queue
record-no-offset = { $time } (no offset)
record-within = within { $metres } m
record-photo = photo { $number }
record-photo-file-exif = photo { $number } (the file's EXIF)
record-photo-phone-exif = photo { $number } (the phone's reading of the original)
record-no-exif-time = no EXIF time
record-no-exif-place = no EXIF place
record-taken-before = taken { $gap } before the record
record-taken-after = taken { $gap } after the record
record-from-place = { $distance } from the record's place
record-flag-cut-short = photo file cut short: part of the picture is missing
record-photo-check = photo { $number } ({ $reading }): { $facts }
record-key-heading = Guided key
record-key-picked = The observer picked { $name } ({ $rank }, { $percent }% when picked).
record-key-now = What the key suggests for these answers now, most likely first:
record-photo-alt = photo { $number } of the record: tap to open it large
record-no-guess = no guess
record-no-name = an observer who gave no name
record-sent-by = Sent by { $name } · { $contact }
record-guess = Observer's guess: { $guess }
record-name-reading = Name “{ $typed }” → { $reading }. Public place: { $place }
record-contact-use = { " " }(the contact is for questions about this record only; never exported)
record-map = map of where the record and its photos were made
record-when = when
record-where = where
record-device = device
record-fields = count { $count } · { $condition } · { $setting } · sex { $sex }
record-length = { $cm } cm { $kind } ({ $method })
record-signs = signs: { $signs }
record-observer = observer: { $name }
record-flags-heading = Flags and priority
record-identifications = Identifications
record-identification = { $name } ({ $rank }) by { $who } on { $day } [{ $basis }]{ $remarks }
record-no-rank = rank not given
record-messages = Messages
record-history = History
record-event = { $at } { $from } → { $to } by { $who }: { $detail }{ $reason }
record-decide = Decide
record-scientific-name = Scientific name
record-rank = Rank
record-remark = Remark
record-confirm = Confirm
record-message = Message to the observer, or the reason
record-ask = Ask the observer
record-not-confirmable = Not confirmable
record-message-hint = The message, or the reason for “not confirmable”, is sent to the observer's phone.

## People (desk, admins)

people-hint = Observers need no sign-in: their phone gets its own identity. Contacts never leave the server.
people-sign-in-first = { $problem } (sign in as an admin under Review first)
people-now-role = { $who } is now { $role }.
people-new-password = { $who } has a new password; their sign-ins ended.
people-turned-off = { $who }'s sign-in is turned off.
people-turned-on = { $who }'s sign-in is turned on.
people-off-mark = { " " }· turned off
people-role = Role
people-new-password-label = New password
people-set-password = Set password
people-turn-on = Turn on
people-turn-off = Turn off
people-add-legend = Add a person
people-name-shown = Name shown
people-password = Password (10+ characters)
people-add = Add
people-added = { $who } was added as { $role }. Give them their password in person; they sign in under Review.
people-changes = Changes to sign-ins
people-event = { $at } · { $who } · { $action } · by { $by }
people-command-line = the server's command line
people-back = ← Review
role-observer = observer
role-reviewer = reviewer
role-admin = admin
role-responder = responder

## Downloads (desk)

downloads-heading = Download records
downloads-public-form = The public form generalises sensitive species (Chapman 2020, GBIF): their positions are rounded or withheld, and say so. Observers' contacts are never included.
downloads-format = Format
downloads-dwca = Darwin Core Archive (zip)
downloads-csv = CSV
downloads-geojson = GeoJSON
downloads-taxon = Taxon (blank: all)
downloads-full = { " " }Full form: positions as recorded, sensitive species included (reviewers and admins only; do not pass it on)
downloads-download = Download
downloads-state-confirmed = Counting confirmed records only: those a reviewer has checked.
downloads-state-any = Counting every stored record, reviewed or not: unconfirmed records may be wrong.
downloads-state-other = Counting records in the state “{ $state }” only.

## Built in data/ (desk)

# The figures table (data/figures.rs). EOO and AOO keep their IUCN names.
figures-row-records = Records
figures-row-sites = Distinct sites
figures-row-eoo = EOO
figures-row-aoo = AOO
figures-row-least-aoo = Least AOO (shifted grids)
figures-area = { $area } km²
figures-area-change-percent = { $area } km² ({ $percent }%)
figures-percent = { $percent }%
figures-percent-over = over +{ $limit }%
figures-percent-below = below −{ $limit }%
# The trend's lines: a label, then its text.
figures-rate-label = Rate of change per year
figures-window-label = Change over the assessment window
figures-years-fitted-label = Years fitted
figures-window-chosen-label = How the window was chosen
figures-model-label = Dispersion and model
figures-mann-kendall-label = Mann–Kendall (tie-corrected)
figures-counts-label = Animals recorded per year
figures-change-interval = { $change } (95% interval { $lower } to { $upper })
figures-window-change = { $change } over { $window } years
figures-window-change-extrapolated = { $change } over { $window } years, extrapolated beyond the years covered
figures-window-not-given = not given: the { $window }-year window reaches too far beyond the { $span } years fitted ({ $first }–{ $last }) to carry the trend over it. The change per year is given; more years of data are needed for the window.
figures-years-fitted = { $first }–{ $last } (the most recent assessment window; earlier years are not fitted)
figures-window-chosen = { $window } years = the longer of 10 years and 3 × generation length ({ $generation } years; { $source }), IUCN criterion A
figures-model = Pearson dispersion { $dispersion }; { $model }
figures-model-quasi-poisson-t = quasi-Poisson: errors scaled by the dispersion, intervals from Student's t with { $df } degrees of freedom
figures-model-quasi-poisson = quasi-Poisson: errors scaled by the dispersion
figures-model-negative-binomial = negative binomial (its AIC is lower than the Poisson's), intervals from the normal distribution
figures-model-poisson = Poisson errors, intervals from the normal distribution
figures-mann-kendall = tau = { $tau }, p = { $p }; Sen's slope { $slope } per year
figures-no-counts = none

# Forms and notifications of the people who go out (data/fieldwork.rs).
fieldwork-choose-date-time = choose a date and time
fieldwork-choose-from-list = choose one from the list
fieldwork-channel-email = email
fieldwork-channel-webhook = webhook
fieldwork-notification-delivered = { $channel }: delivered { $at } after { $attempts ->
    [one] { $attempts } attempt
   *[other] { $attempts } attempts
}
fieldwork-notification-failing = { $channel }: not delivered yet after { $attempts ->
    [one] { $attempts } attempt
   *[other] { $attempts } attempts
}; the last failed: { $error }
fieldwork-notification-waiting = { $channel }: waiting to be sent

# A photo's readings, gaps and distances on the record screen (data/readable.rs).
readable-time-and-place-from = time from { $time }, place from { $place }
readable-no-exif = no EXIF
readable-phone-reading = the phone's reading of the original
readable-file-exif = the file's EXIF
readable-offset-photo = photo's offset
readable-offset-phone = phone's offset then
readable-offset-record = record's offset
readable-gap-hours = { $hours } h
readable-gap-days = { $days } days
readable-distance-m = { $metres } m
readable-distance-km = { $km } km

# The animal's sex on the record screen, and changes to sign-ins (data/labels.rs).
sex-male = male
sex-female = female
sex-unknown = not known
people-action-added = added as { $role }
people-action-role-changed = role changed ({ $from } → { $to })
people-action-password-reset = password reset; their sign-ins ended
people-action-turned-off = sign-in turned off
people-action-turned-on = sign-in turned on

## What an identification rests on (data/labels.rs)

basis-observer-guess = the observer's guess
basis-observer-key = the observer, with the guided key
basis-reviewer = a reviewer

## Why a record stands where it is in the queue (data/labels.rs)

priority-live-animal = a live animal: no response logged yet
priority-holds-species = {" "}(or holds species that are)
priority-protected = { $taxon } is protected{ $holds }
priority-sensitive = { $taxon } is sensitive{ $holds }: its public locations are generalised
priority-possible-duplicate = possibly the same animal as another report: compare them
priority-long = long
priority-far = far
priority-photo-older = photo older than the record: photo { $photo } was taken { $gap } before it (more than { $limit } h): an older photo reused?
priority-photo-far = photo far from the record: photo { $photo } was taken { $distance } from its place (more than { $limit } km beyond both uncertainties)
priority-photo-cut-short = photo { $photo }'s file is cut short: part of the picture is missing
