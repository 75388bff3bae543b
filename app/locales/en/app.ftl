# wrackline's words in English: the catalogue every other language follows.
# One message per id; ids are named after the screen they are on. Placeholders ($name)
# must be the same in every language (the app's catalogue test checks it).

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

## The phone's page

phone-safety-link = Safety
phone-figures-link = Figures
phone-review-link = Review
phone-install = Install
phone-online = online
phone-offline = offline: records wait on this phone
phone-storage-broken = Offline storage is not working: { $problem }. Records cannot be kept on this phone.
phone-safety-heading = Safety on the shore
phone-back = ← Back to recording
phone-question-one = A reviewer asked you something about a record: answer it under My records.
phone-question-many = Reviewers asked you about some records: answer them under My records.
phone-safety-reminders = Safety reminders: spines, bites, tides
phone-first-record = Before your first record
phone-safety-read = I have read this

## About you (phone)

about-heading = About you
about-both-optional = Both boxes may stay empty; your records are sent either way.
about-name = Your name (reviewers see it with your records)
about-name-public = Publish my name with my records in open data
about-open-data = Records are shared as open data for research. Unticked, they are shared without your name, under an anonymous label.
about-contact = Email or phone number
about-contact-use = Your contact is only for reviewers with a question about your records. It is never published, never exported and never shown to anyone else.
about-save = Save
about-not-now = Not now
about-not-now-note = Not now: your records are sent without a name. You can add one here at any time.
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

## Sync states and the outbox (phone)

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

## On this phone (phone)

phone-outbox-heading = On this phone
phone-send-now = Send now
phone-live-sent-first = live animal: sent first
phone-on-walk = on a survey walk
phone-edit-again = Edit and send again
phone-discard = Discard
phone-send = Send
phone-add-to-walk = Add to a walk…

## Survey walks (phone)

walk-not-saved = Could not save the walk on this phone: { $problem }
walk-saved = Walk saved on this phone.
walk-active = Survey walk: { $title }
walk-progress = { $minutes } min · { $km } km · { $points } points on the route so far
walk-all-finds-on = You are reporting every shark, ray, skate and egg case you find.
walk-not-all-finds = Not every find will be reported on this walk.
walk-linked = Records you make now are linked to this walk. Keep the app open to record the route.
walk-end = End walk
walk-heading = Survey walk
walk-why = Log your walks even when you find nothing: how far and how long people looked is what makes the counts mean something.
walk-stretch = Stretch of coast (optional)
walk-all-finds = I will report every shark, ray, skate and egg case I find on this walk
walk-start = Start walk
walk-past = Enter a past walk by hand
walk-started = Started
walk-ended = Ended
walk-distance = Distance (km)
walk-save = Save walk
walk-list-item = { $title } · { $km } km
walk-walking-now = walking now
walk-give-times = Give the walk's start and end.
walk-give-distance = Give the distance walked in kilometres (0 to 100).
walk-ends-before-start = The walk ends before it starts.
walk-untitled = walk
walk-fix-rough = position too rough (within { $metres } m only), waiting for a better one
walk-fix-good = position known to within { $metres } m
walk-no-fix = no position ({ $problem }); the walk goes on, but its track will be short

## My records (phone)

mine-heading = My records
mine-intro = As the reviewers last saw them; updated each time this phone syncs.
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
mine-answer-kept = Answer kept on this phone; it goes with the next sync.
mine-answer-not-kept = Could not keep the answer on this phone: { $problem }
mine-answer-reviewer = Answer the reviewer
mine-add-note = Add a note or photo for the reviewers
mine-you = you
mine-a-reviewer = a reviewer
mine-asked-flag = A reviewer asked you something:
mine-add-photo = Add photo
mine-send-answer = Send answer
mine-answers-waiting =
    { $count ->
        [one] 1 answer waiting to send
       *[other] { $count } answers waiting to send
    }
photo-preparing = preparing “{ $name }”…
photo-alt = photo: { $name }
photo-count =
    { $count ->
        [one] 1 photo
       *[other] { $count } photos
    }

## Record form: names of the controls and problems (phone)

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

## Live animal (phone)

live-call-number = Call the responders: { $number }
live-heading = A live animal: get help first
live-keep-back = Keep back, and keep dogs and people back. A shark can bite and a ray's spine can sting, even when it seems weak.
live-no-pushing = Do not drag or push it back to sea unless you are trained: you can hurt it and yourself.
live-follow = Follow the responders' directions when you reach them.
live-call = Call the local stranding responders or the coastguard now.
live-step-say = Say where it is, what it is if you know, and whether the tide is coming in.
live-step-photos = Take photos from where you stand; do not go closer for them.
live-step-stay = If it is safe, stay nearby and keep others back until help comes.
live-step-save = Save this record: it goes to the responders before anything else, as soon as the phone has a connection.

## Record form (phone)

form-finding-position = finding your position…
form-position-from-phone = from this phone, { $fix }
form-no-position = no position from this phone ({ $problem }); type it, or try again
form-position-at-saving = Position at saving: { $fix }.
form-no-position-at-saving = No fresh position at saving ({ $problem }): the record keeps the one from when the form opened.
form-not-saved-yet = Not saved yet: put right what is marked in red, then save again.
form-saved-live = Saved on this phone. A live animal: it goes to the responders before anything else, as soon as there is a connection.
form-saved = Saved on this phone; it will be sent when there is a connection.
form-saved-draft = Saved as a draft on this phone.
form-not-saved = Could not save on this phone: { $problem }. Your form is kept as it is.
form-photo-name = photo { $number }
form-editing-refused = Editing a record the server did not accept: put it right and save it again.
form-heading = New record
form-alive = The animal is alive
form-local-time = this phone's local time ({ $zone })
form-use-device-time = Use this phone's time and place instead
form-where = Where
form-accuracy-hint = Accuracy: how far off the position may be, as the phone or GPS says.
form-use-my-position = Use my position
form-what = What
form-species = Species (your best guess)
form-species-example = e.g. small-spotted catshark
form-key-choice = Picked with the key: { $name } ({ $rank }, { $percent }% likely when picked)
form-hide-key = Hide the key
form-open-key = Help me identify
form-unit = Unit
form-which-length = Which length
form-how-measured = How
form-measured = measured
form-estimated = estimated
form-sex = Sex
form-sex-unknown = not known
form-sex-male = male (claspers seen)
form-sex-female = female (no claspers)
form-not-sure = not sure
form-claspers-hint = Claspers: a male's two rod-like organs along the inner edge of the fins under the rear of the body (pelvic fins). A female has none.
form-egg-case-hint = Egg cases: count them in “How many”; no length needed (write a case's size in the notes).
form-condition-legend = Condition and how it was found
form-choose = choose…
form-signs = Signs of fishing or people:
form-saving = Saving…
form-save-send = Save and send
form-keep-draft = Keep as draft

## Position fixes (phone)

fix-age-seconds = { $n } s old
fix-age-minutes = { $n } min old
fix-age-hours = { $n } h old
fix-age-days = { $n } days old
fix-within = within { $metres } m, { $age }

## The record form's photos (phone)

photos-legend = Photos
photos-add = Add photo
photos-alt = photo { $number }: { $name }
photos-remove = remove
photos-count =
    { $count ->
        [one] 1 photo
       *[other] { $count } photos
    }
photos-preparing = preparing “{ $name }”…
photos-already-added = “{ $name }”: this photo is already added.
photos-gps-first = from the first photo's GPS
photos-gps-numbered = from photo { $number }'s GPS
photos-gps-no-device = { " " }(this phone gave no position)
photos-position-cleared = the position came from the removed photo and was cleared; use my position or type it

## The species key (phone)

key-hint = Answer what you can see; "not sure" is always fine. Do not touch a ray's tail spine or the spines on a spurdog's or chimaera's back.
key-not-sure-skip = Not sure / skip
key-no-further-question = No further question would tell these apart: pick from the list, or stop at a higher rank.
key-this-one = This one
key-suggested = Suggested:{ " " }
key-set-aside = The checklist has changed, so these answers are set aside: { $answers }.
key-cannot-separate = These questions cannot tell { $top } from { $others }; a reviewer will check the photos.
key-change = change
key-most-likely = Most likely
key-group-heading = Or record the group you are sure of
key-group-hint = Sure it is a skate, or a catshark, but not which one? Record the group. The one marked “Suggested” is the smallest group the key is fairly sure of.
key-your-answers = Your answers ({ $count })
key-start-again = Start again
key-close = Close the key
