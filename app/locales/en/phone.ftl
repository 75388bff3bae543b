# The phone's own words in English, in the phone's bundle only (the desk's bundle never
# carries them): recording, walks, the outbox and my records. Same rules as app.ftl;
# ids differ from app.ftl's and desk.ftl's.

## The phone's page

phone-install = Install
phone-online = online
phone-offline = offline: records wait on this phone
phone-storage-broken = Offline storage is not working: { $problem }. Records cannot be kept on this phone.
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

## My records (phone)

mine-heading = My records
mine-intro = As the reviewers last saw them; updated each time this phone syncs.
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

## Live animal (phone)

live-call-number = Call the responders: { $number }
live-heading = A live animal: get help first
live-keep-back = Keep back, and keep dogs and people back. A shark can bite and a ray's spine can sting, even when it seems weak.
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
