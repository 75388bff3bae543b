# Geiriau wrackline yn Gymraeg (Welsh).
# FIRST DRAFT, not yet checked: written by the developers, to be read and corrected by a
# native Welsh speaker (ideally one who knows the shore and stranding work) before use.
# The safety cautions and the live-animal instructions most of all.
# Every id of ../en/app.ftl is here with the same placeholders (the catalogue test checks it).

## Safety (both bundles)

safety-call-number = Anifail byw neu wedi'i olchi i'r lan? Ffoniwch yr ymatebwyr lleol: { $number }. Neu Wylwyr y Glannau.
safety-call = Anifail byw neu wedi'i olchi i'r lan? Ffoniwch yr ymatebwyr lleol i anifeiliaid môr ar y lan, neu Wylwyr y Glannau.
safety-keep-back = Cadwch draw o unrhyw anifail byw a chadwch gŵn draw. Gall siarc sy'n edrych yn farw frathu o hyd.
safety-spines = Mae'r pigau'n wenwynig, hyd yn oed ar anifail marw: pigyn y gynffon (colyn) ar forgathod â cholyn a morgathod eryr, a'r pigau o flaen esgyll y cefn ar gŵn pigog a chimaeraod. Peidiwch â gafael ynddyn nhw yno. Os cewch eich pigo: rhowch y clwyf mewn dŵr mor boeth ag y gallwch ei oddef (tua 45 °C) am o leiaf 30 munud, a cheisiwch gymorth meddygol.
safety-thorns = Mae gan gathod môr a morgathod pigog ddrain miniog ar y cefn a'r gynffon: gwisgwch fenig neu gadewch lonydd iddyn nhw.
safety-no-pushing = Peidiwch â llusgo na gwthio anifail byw sydd ar y lan yn ôl i'r môr oni bai eich bod wedi'ch hyfforddi.
safety-tide = Gwyliwch y llanw, y tonnau a'ch traed. Does dim cofnod yn werth cael eich dal gan y llanw.
safety-no-eating = Peidiwch â bwyta anifail sydd wedi'i olchi i'r lan na chymryd darnau ohono: gall fod yn anniogel, ac i rywogaethau gwarchodedig gall fod yn anghyfreithlon. Golchwch eich dwylo ar ôl cyffwrdd ag unrhyw beth.
safety-local-rules = Rheolau lleol a chyfarwyddiadau'r ymatebwyr a'r awdurdodau sy'n dod gyntaf.

## The language switch (both bundles)

language-switch = Iaith

## The phone's page

phone-safety-link = Diogelwch
phone-figures-link = Ffigurau
phone-review-link = Adolygu
phone-install = Gosod
phone-online = ar-lein
phone-offline = all-lein: mae'r cofnodion yn aros ar y ffôn hwn
phone-storage-broken = Dydy'r storfa all-lein ddim yn gweithio: { $problem }. Does dim modd cadw cofnodion ar y ffôn hwn.
phone-safety-heading = Diogelwch ar y traeth
phone-back = ← Yn ôl i gofnodi
phone-question-one = Mae adolygydd wedi gofyn rhywbeth i chi am gofnod: atebwch o dan Fy nghofnodion.
phone-question-many = Mae adolygwyr wedi gofyn i chi am rai cofnodion: atebwch o dan Fy nghofnodion.
phone-safety-reminders = Atgoffa am ddiogelwch: pigau, brathiadau, llanw
phone-first-record = Cyn eich cofnod cyntaf
phone-safety-read = Rwyf wedi darllen hwn

## About you (phone)

about-heading = Amdanoch chi
about-both-optional = Gall y ddau flwch aros yn wag; caiff eich cofnodion eu hanfon beth bynnag.
about-name = Eich enw (mae'r adolygwyr yn ei weld gyda'ch cofnodion)
about-name-public = Cyhoeddi fy enw gyda'm cofnodion mewn data agored
about-open-data = Caiff cofnodion eu rhannu fel data agored ar gyfer ymchwil. Heb dic, cânt eu rhannu heb eich enw, o dan label dienw.
about-contact = E-bost neu rif ffôn
about-contact-use = Mae'ch manylion cyswllt ar gyfer adolygwyr sydd â chwestiwn am eich cofnodion yn unig. Ni chânt byth eu cyhoeddi, eu hallforio na'u dangos i neb arall.
about-save = Cadw
about-not-now = Nid nawr
about-not-now-note = Nid nawr: caiff eich cofnodion eu hanfon heb enw. Gallwch ychwanegu un yma unrhyw bryd.
about-saved = { $named }; { $reach }{ $open_data }. Bydd yn mynd gyda'r cysoni nesaf.
about-saved-no-name = Wedi'i gadw: mae'ch cofnodion yn mynd heb enw
about-saved-as = Wedi'i gadw: mae'ch cofnodion yn mynd fel { $name }
about-saved-no-contact = dim manylion cyswllt, felly ni all adolygwyr ofyn i chi am ganfyddiad
about-saved-contact = gall adolygwyr gysylltu â chi am eich canfyddiadau; ni chaiff eich manylion cyswllt byth eu cyhoeddi
about-saved-named-in-open-data = ; mae'r data agored yn eich enwi
about-saved-anonymous-in-open-data = ; mae'r data agored yn dangos label dienw yn lle'ch enw
about-no-name = dim enw
about-no-contact = dim cyswllt
about-contact-given = cyswllt wedi'i roi

## Sync states and the outbox (phone)

sync-draft = drafft
sync-waiting = yn aros i anfon
sync-sent = wedi'i anfon, yn aros am y gweinydd
sync-received = wedi'i dderbyn gan y gweinydd
sync-refused = heb ei dderbyn gan y gweinydd: { $problem }
sync-sending = yn anfon…
sync-retry = { $problem }; rhoi cynnig arall ymhen { $seconds } eiliad
record-unnamed = anifail heb enw
record-summary-length = , { $cm } cm { $kind }
record-summary =
    { $what }{ $length } · { $when } · { $photos ->
        [zero] dim lluniau
        [one] 1 llun
        [two] 2 lun
       *[other] { $photos } llun
    }
storage-full = Heb ei gadw: mae storfa wrackline ar y ffôn hwn yn llawn ({ $used } o { $quota } MB gyda'r cofnod hwn). Anfonwch gofnodion sy'n aros neu rhyddhewch le ar y ffôn, yna cadwch eto. Mae'ch ffurflen wedi'i chadw fel y mae.
storage-nearly-full = Rhybudd: mae storfa wrackline ar y ffôn hwn bron yn llawn ({ $used } o { $quota } MB). Anfonwch gofnodion sy'n aros yn fuan.

## Values of the shared vocabulary (both bundles)

length-total = hyd cyfan
length-fork = hyd fforch
length-precaudal = hyd cyn y gynffon
length-disc-width = lled y ddisg
length-disc-length = hyd y ddisg
condition-alive = yn fyw
condition-fresh-dead = newydd farw
condition-decomposed = wedi pydru
condition-remains-only = gweddillion yn unig
setting-beach-stranding = wedi'i olchi i'r traeth
setting-angler-catch = dalfa pysgotwr gwialen
setting-landing-site = safle glanio neu farchnad
setting-floating = yn arnofio ar y môr
setting-discarded-bycatch = sgil-ddalfa wedi'i thaflu
stage-egg-case = cas wy
stage-embryo = embryo
stage-juvenile = ifanc
stage-adult = oedolyn
sign-hook = bachyn
sign-line = lein
sign-net-marks = olion rhwyd
sign-fins-removed = esgyll wedi'u torri i ffwrdd
sign-boat-strike = wedi'i daro gan gwch

## On this phone (phone)

phone-outbox-heading = Ar y ffôn hwn
phone-send-now = Anfon nawr
phone-live-sent-first = anifail byw: yn cael ei anfon gyntaf
phone-on-walk = ar daith arolwg
phone-edit-again = Golygu ac anfon eto
phone-discard = Taflu
phone-send = Anfon
phone-add-to-walk = Ychwanegu at daith…

## Survey walks (phone)

walk-not-saved = Methu cadw'r daith ar y ffôn hwn: { $problem }
walk-saved = Taith wedi'i chadw ar y ffôn hwn.
walk-active = Taith arolwg: { $title }
walk-progress = { $minutes } munud · { $km } km · { $points } pwynt ar y llwybr hyd yma
walk-all-finds-on = Rydych chi'n cofnodi pob siarc, morgath, cath fôr a chas wy a welwch.
walk-not-all-finds = Ni fydd pob canfyddiad yn cael ei gofnodi ar y daith hon.
walk-linked = Mae'r cofnodion a wnewch nawr yn gysylltiedig â'r daith hon. Cadwch yr ap ar agor i gofnodi'r llwybr.
walk-end = Gorffen y daith
walk-heading = Taith arolwg
walk-why = Cofnodwch eich teithiau hyd yn oed pan na welwch chi ddim: pa mor bell ac am ba hyd y bu pobl yn chwilio sy'n rhoi ystyr i'r cyfrifon.
walk-stretch = Darn o arfordir (dewisol)
walk-all-finds = Byddaf yn cofnodi pob siarc, morgath, cath fôr a chas wy a welaf ar y daith hon
walk-start = Dechrau'r daith
walk-past = Rhoi taith a fu â llaw
walk-started = Dechreuodd
walk-ended = Gorffennodd
walk-distance = Pellter (km)
walk-save = Cadw'r daith
walk-list-item = { $title } · { $km } km
walk-walking-now = yn cerdded nawr
walk-give-times = Rhowch ddechrau a diwedd y daith.
walk-give-distance = Rhowch y pellter a gerddwyd mewn cilometrau (0 i 100).
walk-ends-before-start = Mae'r daith yn gorffen cyn iddi ddechrau.
walk-untitled = taith
walk-fix-rough = safle'n rhy fras (o fewn { $metres } m yn unig), yn aros am un gwell
walk-fix-good = safle'n hysbys o fewn { $metres } m
walk-no-fix = dim safle ({ $problem }); mae'r daith yn parhau, ond bydd ei llwybr yn fyr

## My records (phone)

mine-heading = Fy nghofnodion
mine-intro = Fel y gwelodd yr adolygwyr nhw ddiwethaf; yn cael eu diweddaru bob tro mae'r ffôn hwn yn cysoni.
mine-awaiting = yn aros am adolygydd
mine-awaiting-means = Does dim adolygydd wedi edrych arno eto.
mine-asked = mae adolygydd wedi gofyn rhywbeth i chi
mine-asked-means = Atebwch isod; mae'r cofnod yn aros am eich ateb.
mine-confirmed = wedi'i gadarnhau
mine-confirmed-means = Mae adolygydd wedi cytuno beth ydyw, o'r lluniau a'r manylion.
mine-not-confirmable = methu ei gadarnhau
mine-not-confirmable-reason = Doedd adolygydd ddim yn gallu bod yn siŵr beth oedd e. Eu rheswm: “{ $reason }”. Mae'r cofnod yn cael ei gadw, ond nid yw'n cael ei gyfrif gyda'r rhai wedi'u cadarnhau.
mine-not-confirmable-means = Doedd adolygydd ddim yn gallu bod yn siŵr beth oedd e o'r lluniau a'r manylion. Mae'r cofnod yn cael ei gadw, ond nid yw'n cael ei gyfrif gyda'r rhai wedi'u cadarnhau.
mine-merged = wedi'i uno ag adroddiad arall
mine-merged-means = Mae rhywun arall wedi cofnodi'r un anifail. Mae'r adroddiadau'n cael eu cadw gyda'i gilydd a'r anifail yn cael ei gyfrif unwaith.
mine-answer-too-long = Mae'r ateb hwnnw'n rhy hir.
mine-answer-empty = Ysgrifennwch ateb neu ychwanegwch lun.
mine-answer-kept = Ateb wedi'i gadw ar y ffôn hwn; bydd yn mynd gyda'r cysoni nesaf.
mine-answer-not-kept = Methu cadw'r ateb ar y ffôn hwn: { $problem }
mine-answer-reviewer = Ateb yr adolygydd
mine-add-note = Ychwanegu nodyn neu lun i'r adolygwyr
mine-you = chi
mine-a-reviewer = adolygydd
mine-asked-flag = Mae adolygydd wedi gofyn rhywbeth i chi:
mine-add-photo = Ychwanegu llun
mine-send-answer = Anfon ateb
mine-answers-waiting =
    { $count ->
        [one] 1 ateb yn aros i gael ei anfon
       *[other] { $count } ateb yn aros i gael eu hanfon
    }
photo-preparing = yn paratoi “{ $name }”…
photo-alt = llun: { $name }
photo-count =
    { $count ->
        [zero] dim lluniau
        [one] 1 llun
        [two] 2 lun
       *[other] { $count } llun
    }

## Record form: names of the controls and problems (phone)

form-when = Pryd
form-latitude = Lledred
form-longitude = Hydred
form-accuracy = Cywirdeb (metrau)
form-species-short = Rhywogaeth
form-length = Hyd
form-count = Faint
form-life-stage = Cyfnod bywyd
form-condition = Cyflwr
form-how-found = Sut y cafwyd hyd iddo
form-signs-short = Olion pysgota neu bobl
form-notes = Nodiadau
form-photos = Lluniau
form-your-name = Eich enw
problem-too-long = rhy hir: { $max } nod ar y mwyaf
problem-future = mae hyn yn y dyfodol: rhowch yr amser y gwelwyd yr anifail
problem-sign-twice = mae olion wedi'u ticio ddwywaith
problem-key-pick = methu cadw dewis yr allwedd; dewiswch eto neu teipiwch yr enw
problem-egg-case-length = does gan gas wy ddim hyd corff: gadewch hwn yn wag ac ysgrifennwch faint y cas yn y nodiadau
problem-choose-when = dewiswch y dyddiad a'r amser y gwelwyd yr anifail
problem-count = rhif cyfan o 1 i { $max }
problem-choose-condition = dewiswch gyflwr yr anifail
problem-choose-how-found = dewiswch sut y cafwyd hyd iddo
problem-degrees = rhif mewn graddau degol, e.e. 52.4153
problem-latitude = rhwng -90 a 90
problem-longitude = rhwng -180 a 180
problem-accuracy = nifer o fetrau dros 0
problem-a-number = rhif

## Live animal (phone)

live-call-number = Ffoniwch yr ymatebwyr: { $number }
live-heading = Anifail byw: mynnwch help yn gyntaf
live-keep-back = Cadwch draw, a chadwch gŵn a phobl draw. Gall siarc frathu a gall pigyn morgath bigo, hyd yn oed pan fo'n ymddangos yn wan.
live-no-pushing = Peidiwch â'i lusgo na'i wthio yn ôl i'r môr oni bai eich bod wedi'ch hyfforddi: gallwch ei anafu ac anafu'ch hun.
live-follow = Dilynwch gyfarwyddiadau'r ymatebwyr pan fyddwch yn cysylltu â nhw.
live-call = Ffoniwch yr ymatebwyr lleol i anifeiliaid môr ar y lan, neu Wylwyr y Glannau, nawr.
live-step-say = Dywedwch ble mae e, beth yw e os ydych chi'n gwybod, ac a yw'r llanw'n dod i mewn.
live-step-photos = Tynnwch luniau o'r fan lle rydych chi'n sefyll; peidiwch â mynd yn nes i'w tynnu.
live-step-stay = Os yw'n ddiogel, arhoswch gerllaw a chadwch eraill draw nes daw help.
live-step-save = Cadwch y cofnod hwn: mae'n mynd at yr ymatebwyr cyn dim arall, cyn gynted ag y bydd gan y ffôn gysylltiad.

## Record form (phone)

form-finding-position = yn chwilio am eich safle…
form-position-from-phone = o'r ffôn hwn, { $fix }
form-no-position = dim safle o'r ffôn hwn ({ $problem }); teipiwch ef, neu rhowch gynnig arall
form-position-at-saving = Safle wrth gadw: { $fix }.
form-no-position-at-saving = Dim safle newydd wrth gadw ({ $problem }): mae'r cofnod yn cadw'r un o pan agorwyd y ffurflen.
form-not-saved-yet = Heb ei gadw eto: cywirwch yr hyn sydd wedi'i farcio mewn coch, yna cadwch eto.
form-saved-live = Wedi'i gadw ar y ffôn hwn. Anifail byw: mae'n mynd at yr ymatebwyr cyn dim arall, cyn gynted ag y bydd cysylltiad.
form-saved = Wedi'i gadw ar y ffôn hwn; caiff ei anfon pan fydd cysylltiad.
form-saved-draft = Wedi'i gadw fel drafft ar y ffôn hwn.
form-not-saved = Methu cadw ar y ffôn hwn: { $problem }. Mae'ch ffurflen wedi'i chadw fel y mae.
form-photo-name = llun { $number }
form-editing-refused = Golygu cofnod na dderbyniodd y gweinydd: cywirwch ef a'i gadw eto.
form-heading = Cofnod newydd
form-alive = Mae'r anifail yn fyw
form-local-time = amser lleol y ffôn hwn ({ $zone })
form-use-device-time = Defnyddio amser a lle'r ffôn hwn yn lle hynny
form-where = Ble
form-accuracy-hint = Cywirdeb: pa mor bell y gall y safle fod yn anghywir, yn ôl y ffôn neu'r GPS.
form-use-my-position = Defnyddio fy safle
form-what = Beth
form-species = Rhywogaeth (eich dyfaliad gorau)
form-species-example = e.e. morgi mannog bach
form-key-choice = Wedi'i ddewis gyda'r allwedd: { $name } ({ $rank }, { $percent }% yn debygol wrth ei ddewis)
form-hide-key = Cuddio'r allwedd
form-open-key = Helpwch fi i adnabod
form-unit = Uned
form-which-length = Pa hyd
form-how-measured = Sut
form-measured = wedi'i fesur
form-estimated = wedi'i amcangyfrif
form-sex = Rhyw
form-sex-unknown = ddim yn hysbys
form-sex-male = gwryw (claspers i'w gweld)
form-sex-female = benyw (dim claspers)
form-not-sure = ddim yn siŵr
form-claspers-hint = Claspers: dau organ fel gwiail sydd gan wryw ar hyd ymyl fewnol yr esgyll o dan gefn y corff (esgyll y pelfis). Does gan fenyw ddim.
form-egg-case-hint = Casys wyau: cyfrifwch nhw yn “Faint”; does dim angen hyd (ysgrifennwch faint cas yn y nodiadau).
form-condition-legend = Cyflwr a sut y cafwyd hyd iddo
form-choose = dewiswch…
form-signs = Olion pysgota neu bobl:
form-saving = Yn cadw…
form-save-send = Cadw ac anfon
form-keep-draft = Cadw fel drafft

## Position fixes (phone)

fix-age-seconds = ers { $n } eiliad
fix-age-minutes = ers { $n } munud
fix-age-hours = ers { $n } awr
fix-age-days = ers { $n } diwrnod
fix-within = o fewn { $metres } m, { $age }

## The record form's photos (phone)

photos-legend = Lluniau
photos-add = Ychwanegu llun
photos-alt = llun { $number }: { $name }
photos-remove = tynnu
photos-count =
    { $count ->
        [zero] dim lluniau
        [one] 1 llun
        [two] 2 lun
       *[other] { $count } llun
    }
photos-preparing = yn paratoi “{ $name }”…
photos-already-added = “{ $name }”: mae'r llun hwn wedi'i ychwanegu'n barod.
photos-gps-first = o GPS y llun cyntaf
photos-gps-numbered = o GPS llun { $number }
photos-gps-no-device = { " " }(ni roddodd y ffôn hwn safle)
photos-position-cleared = daeth y safle o'r llun a dynnwyd ac mae wedi'i glirio; defnyddiwch fy safle neu teipiwch ef

## The species key (phone)

key-hint = Atebwch yr hyn a welwch; mae "ddim yn siŵr" bob amser yn iawn. Peidiwch â chyffwrdd â phigyn cynffon morgath na'r pigau ar gefn ci pigog neu chimaera.
key-not-sure-skip = Ddim yn siŵr / neidio
key-no-further-question = Does dim cwestiwn arall a allai wahaniaethu rhwng y rhain: dewiswch o'r rhestr, neu stopiwch ar reng uwch.
key-this-one = Hwn
key-suggested = Awgrym:{ " " }
key-set-aside = Mae'r rhestr wirio wedi newid, felly mae'r atebion hyn wedi'u rhoi o'r neilltu: { $answers }.
key-cannot-separate = Ni all y cwestiynau hyn wahaniaethu rhwng { $top } a { $others }; bydd adolygydd yn gwirio'r lluniau.
key-change = newid
key-most-likely = Mwyaf tebygol
key-group-heading = Neu cofnodwch y grŵp rydych chi'n siŵr ohono
key-group-hint = Yn siŵr mai morgath neu forgi yw e, ond ddim pa un? Cofnodwch y grŵp. Yr un sydd wedi'i farcio “Awgrym” yw'r grŵp lleiaf y mae'r allwedd yn weddol siŵr ohono.
key-your-answers = Eich atebion ({ $count })
key-start-again = Dechrau eto
key-close = Cau'r allwedd
