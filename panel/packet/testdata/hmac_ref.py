#!/usr/bin/python3
# Reference values for code_test.go, from Python's hmac/hashlib (RFC 2104,
# FIPS 180-4), independent of the Go implementation.
import hmac, hashlib

secret = b"0123456789abcdef-test-secret"

def mac(*parts):
    return hmac.new(secret, b"\x00".join(p.encode() for p in parts), hashlib.sha256).digest()

# CheckValue(secret, "STUDY-1", "P-alice-00000000", "alice", ["K7QX2M","22ABCD","ZZ9999"])
print("check", mac("STUDY-1", "P-alice-00000000", "alice", *sorted(["K7QX2M", "22ABCD", "ZZ9999"])).hex()[:32])

# PacketID(secret, "STUDY-1", "alice", 42, ["ev-b","ev-a"])
print("packet", "P-alice-" + mac("packet", "STUDY-1", "alice", "42", *sorted(["ev-b", "ev-a"]))[:4].hex())

# ItemCode(secret, "P-alice-00000000", "ev-a", 1, 0)
alpha = "23456789ABCDFGHJKMNPQRSTUVWXYZ"
v = int.from_bytes(mac("item", "P-alice-00000000", "ev-a", "1", "0")[:8], "big")
code = ""
for _ in range(6):
    code += alpha[v % 30]
    v //= 30
print("item", code)
