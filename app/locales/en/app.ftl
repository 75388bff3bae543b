# wrackline's words in English: the catalogue every other language follows.
# One message per id; ids are named after the screen they are on. Placeholders ($name)
# must be the same in every language (the app's catalogue test checks it). This file is in
# both bundles; words only the phone's screens use are in phone.ftl, the desk's in desk.ftl.

## Safety (both bundles)

safety-call-number = Live or stranded animal? Call the local responders: { $number }. Or the coastguard.
safety-call = Live or stranded animal? Call the local stranding responders or the coastguard.
safety-keep-back = Keep back from any live animal and keep dogs away. A shark that looks dead can still bite.
safety-spines = Spines are venomous, even on a dead animal: the tail spine (sting) of stingrays and eagle rays, and the spines at the front of the back fins of spurdogs (spiny dogfish) and chimaeras (rabbitfish). Do not hold them there. If stung: put the wound in water as hot as you can bear (about 45 °C) for at least 30 minutes, and get medical help.
safety-thorns = Skates and thornback rays carry sharp thorns on the back and tail: wear gloves or leave them be.
safety-no-pushing = Do not drag or push a live stranded animal back to sea unless you are trained.
safety-tide = Watch the tide, the waves and your footing. No record is worth being cut off.
safety-no-eating = Do not eat a stranded animal or take parts of it: it may be unsafe, and for protected species it may be illegal. Wash your hands after touching anything.
safety-local-rules = Local rules and the directions of responders and authorities come first.

## The language switch (both bundles)

language-switch = Language

## The phone's page (both bundles: its links and safety heading)

phone-safety-link = Safety
phone-figures-link = Figures
phone-review-link = Review
phone-safety-heading = Safety on the shore

## About you (words built in data modules, both bundles)

about-saved = { $named }; { $reach }{ $open_data }. It goes with the next sync.
about-saved-no-name = Saved: your records go without a name
about-saved-as = Saved: your records go as { $name }
about-saved-no-contact = no contact given, so reviewers cannot ask you about a find
about-saved-contact = reviewers can reach you about your finds; your contact is never published
about-saved-named-in-open-data = ; open data name you
about-saved-anonymous-in-open-data = ; open data show an anonymous label instead of your name
about-no-name = no name given
about-no-contact = no contact
about-contact-given = contact given

## Sync states and the outbox (words built in data modules, both bundles)

sync-draft = draft
sync-waiting = waiting to send
sync-sent = sent, awaiting the server
sync-received = received by the server
sync-refused = not accepted by the server: { $problem }
sync-sending = sending…
sync-retry = { $problem }; trying again in { $seconds } s
record-unnamed = unnamed animal
record-summary-length = , { $cm } cm { $kind }
record-summary =
    { $what }{ $length } · { $when } · { $photos ->
        [one] 1 photo
       *[other] { $photos } photos
    }
storage-full = Not saved: this phone's storage for wrackline is full ({ $used } of { $quota } MB with this record). Send waiting records or free space on the phone, then save again. Your form is kept as it is.
storage-nearly-full = Warning: this phone's storage for wrackline is nearly full ({ $used } of { $quota } MB). Send waiting records soon.

## Values of the shared vocabulary (both bundles)

length-total = total length
length-fork = fork length
length-precaudal = precaudal length
length-disc-width = disc width
length-disc-length = disc length
condition-alive = alive
condition-fresh-dead = fresh dead
condition-decomposed = decomposed
condition-remains-only = remains only
setting-beach-stranding = beach stranding
setting-angler-catch = angler catch
setting-landing-site = landing site or market
setting-floating = floating at sea
setting-discarded-bycatch = discarded bycatch
stage-egg-case = egg case
stage-embryo = embryo
stage-juvenile = juvenile
stage-adult = adult
sign-hook = hook
sign-line = line
sign-net-marks = net marks
sign-fins-removed = fins removed
sign-boat-strike = boat strike

## Survey walks (words built in data modules, both bundles)

walk-walking-now = walking now
walk-give-times = Give the walk's start and end.
walk-give-distance = Give the distance walked in kilometres (0 to 100).
walk-ends-before-start = The walk ends before it starts.
walk-untitled = walk
walk-fix-rough = position too rough (within { $metres } m only), waiting for a better one
walk-fix-good = position known to within { $metres } m
walk-no-fix = no position ({ $problem }); the walk goes on, but its track will be short

## My records (words built in data modules, both bundles)

mine-awaiting = waiting for a reviewer
mine-awaiting-means = No reviewer has looked at it yet.
mine-asked = a reviewer asked you something
mine-asked-means = Answer below; the record waits for your answer.
mine-confirmed = confirmed
mine-confirmed-means = A reviewer agreed what it is, from the photos and details.
mine-not-confirmable = could not be confirmed
mine-not-confirmable-reason = A reviewer could not be sure what it was. Their reason: “{ $reason }”. The record is kept, but not counted with the confirmed ones.
mine-not-confirmable-means = A reviewer could not be sure what it was from the photos and details. The record is kept, but not counted with the confirmed ones.
mine-merged = joined with another report
mine-merged-means = Someone else reported the same animal. The reports are kept together and the animal is counted once.
mine-answer-too-long = That answer is too long.
mine-answer-empty = Write an answer or add a photo.

## Record form: names of the controls and problems (words built in data modules, both bundles)

form-when = When
form-latitude = Latitude
form-longitude = Longitude
form-accuracy = Accuracy (metres)
form-species-short = Species
form-length = Length
form-count = How many
form-life-stage = Life stage
form-condition = Condition
form-how-found = How it was found
form-signs-short = Signs of fishing or people
form-notes = Notes
form-photos = Photos
form-your-name = Your name
problem-too-long = too long: at most { $max } characters
problem-future = this is in the future: give the time the animal was seen
problem-sign-twice = a sign is ticked twice
problem-key-pick = the key's pick could not be kept; pick again or type the name
problem-egg-case-length = an egg case has no body length: leave it empty and write the case's size in the notes
problem-choose-when = choose the date and time the animal was seen
problem-count = a whole number from 1 to { $max }
problem-choose-condition = choose the state the animal was in
problem-choose-how-found = choose how it came to be found
problem-degrees = a number in decimal degrees, e.g. 52.4153
problem-latitude = between -90 and 90
problem-longitude = between -180 and 180
problem-accuracy = a number of metres above 0
problem-a-number = a number

## Live animal (words built in data modules, both bundles)

live-no-pushing = Do not drag or push it back to sea unless you are trained: you can hurt it and yourself.

## Record form (words built in data modules, both bundles)

form-measured = measured
form-estimated = estimated

## Position fixes (words built in data modules, both bundles)

fix-age-seconds = { $n } s old
fix-age-minutes = { $n } min old
fix-age-hours = { $n } h old
fix-age-days = { $n } days old
fix-within = within { $metres } m, { $age }

## Built in data/ (phone)

# Plain words for an answer the server sent without words of its own (by HTTP status).
api-not-signed-in = you are not signed in, or the sign-in has ended
api-not-allowed = this is not allowed
api-not-known = the server does not know this
api-too-slow = the server took too long to answer
api-other-version = the server has a different version of this
api-too-large = this is too large for the server
api-wrong-kind-of-file = the server does not take this kind of file
api-busy = the server is busy
api-unreachable = the server cannot be reached just now
api-server-problem = the server had a problem
api-not-accepted = the server could not accept this
api-status = { $words } (code { $status })
api-no-connection = no connection to the server
api-unreadable = the server's answer could not be read (a Wi-Fi sign-in page?)
api-unsendable = the request could not be written: { $why }
device-unknown-error = unknown browser error
device-no-upload-copy = no upload copy came back
identity-not-given = the server gave no identity: { $error }
identity-not-kept = could not keep the identity on this phone: { $error }
identity-no-storage = this browser keeps nothing (no localStorage)
identity-storage-refused = the browser refused to keep it (storage full or blocked)
mine-not-fetched = my records: { $error }
outbox-unreadable = a stored record could not be read: { $error }
replies-unreadable = a stored answer could not be read: { $error }
replies-photos-missing = an answer's photos are not all on this phone yet
walks-unreadable = a stored walk could not be read: { $error }
sync-photos-unreadable = photos could not be read: { $error }
sync-photos-missing = { $found } of { $taken } photos found on this phone
sync-walk-not-joined = could not add to the walk: { $error }
span-minutes = { $minutes } min
span-hours = { $hours } h
span-hours-minutes = { $hours } h { $minutes } min
span-days =
    { $days ->
        [one] { $days } day
       *[other] { $days } days
    }
key-rank-species = species
key-rank-genus = genus
key-rank-family = family
key-rank-order = order
key-rank-superorder = superorder
key-set-aside-character = your answer about { $character } (the checklist no longer asks it)
key-set-aside-state = your answer "{ $state }" to "{ $question }" (no longer one of its answers)
photo-unreadable = “{ $name }” could not be read: { $error }
photo-not-prepared = “{ $name }” could not be prepared for sending: { $detail }
photo-start-unreadable = its start could not be read
photo-heic = “{ $name }” is a HEIC photo, which this browser cannot open. Take the photo with “Add photo” here (it saves JPEG), or set the camera to JPEG (on an iPhone: Settings › Camera › Formats › Most Compatible) and pick it again.
photo-cannot-open = “{ $name }” could not be opened as a picture by this browser ({ $detail }). Pick a JPEG or PNG photo instead.
photo-browser-too-old = “{ $name }” could not be prepared for sending: this browser is too old to resize photos ({ $detail }). Update the phone's software (on an iPhone: Settings › General › Software Update) or open wrackline in an up-to-date browser, then add the photo again.
photo-time-camera-zone = { $time } (UTC{ $offset }, the camera's own time zone)
photo-time-phone-zone = { $time } (UTC{ $offset }, this phone's time zone on that date)
photo-no-time = no time
photo-no-position = no position
photo-place = { $lat }, { $lon }
photo-place-within = { $lat }, { $lon } within { $metres } m
photo-says = photo says: { $when } · { $place }
form-photo-time = Time taken from photo { $number }: it was taken { $taken }, { $before } before this phone's time. Keep it if that is when you saw the animal.
form-photo-time-and-place = Time and place taken from photo { $number }: it was taken { $taken }, { $before } before this phone's time. Keep it if that is when you saw the animal.
form-device-says = this phone says: { $time } ({ $offset }) · { $place }

## The guided key's reasons (both bundles: data/key_reasons.rs)

key-reason-not-described = answered "{ $answer }", but the checklist has nothing on this for this species
key-reason-contradicts = answered "{ $answer }", but this species has { $has }
key-reason-or = or
key-reason-unknown-area = area code { $code } is not in this checklist, so range was not used
key-reason-known-from = known from { $area }
key-reason-not-known-from = not known from { $area } in this checklist
key-reason-nearby =
    { $count ->
        [0] no confirmed records nearby
        [one] 1 confirmed record nearby
       *[other] { $count } confirmed records nearby
    }
key-reason-size-not-comparable = a { $measured } cannot be compared with this species' maximum { $maximum }, so size was not used
key-reason-within = { $size } is within this species' known maximum of { $max } cm
key-reason-over = { $size } is over this species' known maximum of { $max } cm
key-reason-newborn = { $size } is smaller than a newborn of this species, which grows to { $max } cm
key-size =
    { $how ->
        [estimated] estimated
       *[measured] measured
    } { $cm } cm
key-size-by-equation =
    { $how ->
        [estimated] estimated
       *[measured] measured
    } { $kind } { $cm } cm (about { $total } cm total length by { $equation }; { $source })
key-size-by-generic-ratio =
    { $how ->
        [estimated] estimated
       *[measured] measured
    } { $kind } { $cm } cm (about { $total } cm total length by the generic ratio { $equation }, common practice: the checklist has no published equation for this species)
