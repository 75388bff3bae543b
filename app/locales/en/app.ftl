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
