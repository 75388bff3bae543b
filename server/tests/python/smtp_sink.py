"""A local SMTP server for the notification tests (aiosmtpd, from PyPI): accepts every
message on 127.0.0.1 and writes each as one JSON line to standard output: the envelope
sender, the recipients, and the message's Subject and body. Prints `ready PORT` first.

Usage: smtp_sink.py PORT   (a free port the caller chose)
"""
import email
import email.policy
import json
import sys
import threading

from aiosmtpd.controller import Controller


class Sink:
    async def handle_DATA(self, server, session, envelope):
        message = email.message_from_bytes(envelope.content, policy=email.policy.default)
        body = message.get_body(preferencelist=("plain",))
        print(json.dumps({
            "from": envelope.mail_from,
            "to": envelope.rcpt_tos,
            "subject": message["Subject"],
            "body": body.get_content() if body else "",
        }), flush=True)
        return "250 Message accepted for delivery"


def main():
    port = int(sys.argv[1])
    controller = Controller(Sink(), hostname="127.0.0.1", port=port)
    controller.start()
    print(f"ready {controller.port}", flush=True)
    try:
        threading.Event().wait()
    finally:
        controller.stop()


if __name__ == "__main__":
    main()
