# Geiriau'r ffôn yn Gymraeg (Welsh), in the phone's bundle only.
# FIRST DRAFT, not yet checked: written by the developers, to be read and corrected in
# Welsh before use. Same rules as app.ftl.

## The phone's page

phone-install = Gosod
phone-online = ar-lein
phone-offline = all-lein: mae'r cofnodion yn aros ar y ffôn hwn
phone-storage-broken = Dydy'r storfa all-lein ddim yn gweithio: { $problem }. Does dim modd cadw cofnodion ar y ffôn hwn.
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

## My records (phone)

mine-heading = Fy nghofnodion
mine-intro = Fel y gwelodd yr adolygwyr nhw ddiwethaf; yn cael eu diweddaru bob tro mae'r ffôn hwn yn cysoni.
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

## Live animal (phone)

live-call-number = Ffoniwch yr ymatebwyr: { $number }
live-heading = Anifail byw: mynnwch help yn gyntaf
live-keep-back = Cadwch draw, a chadwch gŵn a phobl draw. Gall siarc frathu a gall pigyn morgath bigo, hyd yn oed pan fo'n ymddangos yn wan.
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
